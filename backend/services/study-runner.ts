import type { StudyRunner } from "./study-queue";

/** The engine's worker-thread runner behind the queue's interface. */
export function engineRunner(_opts: { threads?: number } = {}): StudyRunner {
  return async () => {
    throw new Error("the engine runner is not wired yet");
  };
}
