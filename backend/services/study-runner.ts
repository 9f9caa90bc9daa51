import { validateStackFile } from "@shared/schemas/stack-file";
import { validateStudy } from "@shared/schemas/study-file";
import type { EnginePool } from "../engine/pool";
import type { StudyRunner } from "./study-queue";

/** The warm engine pool behind the queue's interface. */
export function engineRunner(pool: EnginePool): StudyRunner {
  return async (input, { signal, onProgress, owner }) => {
    // Stored files were validated when they were written; parsing again gives the typed values
    // and catches a row that was edited by hand.
    const stack = validateStackFile(input.stack);
    if (!stack.ok) throw new Error(`The stored stack is not valid: ${stack.issues[0]?.path} ${stack.issues[0]?.message}`);
    const study = validateStudy(input.study, stack.stack);
    if (!study.ok) throw new Error(`The stored study is not valid: ${study.issues[0]?.path} ${study.issues[0]?.message}`);
    const result = await pool.run(stack.stack, study.study, {
      owner,
      signal,
      onProgress: (p) => onProgress(p.trialsDone, p.trialsTotal),
    });
    const passes = result.requirements.length ? result.requirements.every((r) => r.passes) : null;
    return { result, passes };
  };
}
