import { validateStackFile } from "@shared/schemas/stack-file";
import { validateStudy } from "@shared/schemas/study-file";
import { runStudyOnThreads } from "../engine/runner";
import type { StudyRunner } from "./study-queue";

/** The engine's worker-thread runner behind the queue's interface. */
export function engineRunner(opts: { threads?: number } = {}): StudyRunner {
  return async (input, { signal, onProgress }) => {
    // Stored files were validated when they were written; parsing again gives the typed values
    // and catches a row that was edited by hand.
    const stack = validateStackFile(input.stack);
    if (!stack.ok) throw new Error(`The stored stack is not valid: ${stack.issues[0]?.path} ${stack.issues[0]?.message}`);
    const study = validateStudy(input.study, stack.stack);
    if (!study.ok) throw new Error(`The stored study is not valid: ${study.issues[0]?.path} ${study.issues[0]?.message}`);
    const result = await runStudyOnThreads(stack.stack, study.study, {
      threads: opts.threads,
      signal,
      onProgress: (p) => onProgress(p.trialsDone, p.trialsTotal),
    });
    const passes = result.requirements.length ? result.requirements.every((r) => r.passes) : null;
    return { result: result as unknown as Record<string, unknown>, passes };
  };
}
