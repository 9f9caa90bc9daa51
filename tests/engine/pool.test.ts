// The warm engine pool (backend/engine/pool.ts): threads kept between studies, several studies
// at once shared block by block between owners, a dead worker replaced without changing the
// numbers, cancelling one study leaving the others alone. Order of events is asserted, never time.
import { afterAll, describe, expect, it } from "vitest";
import { EnginePool, StudyAbortedError } from "@backend/engine/pool";
import { runStudy } from "@shared/engine/study";
import { estimate } from "@shared/engine/live-estimate";
import { liveStudy } from "@shared/engine/live-study";
import { fixture, referenceStack, studyOf } from "./helpers";

const stack = referenceStack();
const base = studyOf(fixture("study-reference.json"), stack);
const logs: string[] = [];
const pool = new EnginePool({ threads: 2, log: (m) => logs.push(m) });
afterAll(() => pool.stop());

describe("engine pool", () => {
  it("keeps its threads between studies, and gives the in-process numbers", async () => {
    const before = pool.threadsForTest().map((w) => w.threadId);
    const a = await pool.run(stack, base, { trials: 6000 });
    const b = await pool.run(stack, base, { trials: 6000, seed: 11 });
    expect(pool.threadsForTest().map((w) => w.threadId)).toEqual(before);
    expect(JSON.stringify(a)).toBe(JSON.stringify(runStudy(stack, base, { trials: 6000 })));
    expect(JSON.stringify(b)).toBe(JSON.stringify(runStudy(stack, base, { trials: 6000, seed: 11 })));
    // the model parts came from an engine thread (the pool logs when it computes them itself)
    expect(logs.filter((l) => l.includes("model parts"))).toEqual([]);
  });

  it("shares the threads block by block: a short study of another person finishes long before a long one", async () => {
    const longTotal = 40 * 4096;
    let longDone = 0;
    let longDoneWhenShortFinished = -1;
    let startShort!: () => void;
    const shortMayStart = new Promise<void>((r) => (startShort = r));
    const long = pool.run(stack, base, {
      trials: longTotal,
      owner: "alice",
      onProgress: (p) => {
        longDone = p.trialsDone;
        if (p.trialsDone >= 2 * 4096) startShort();
      },
    });
    await shortMayStart;
    const short = await pool.run(stack, base, { trials: 4 * 4096, owner: "bob", seed: 3 });
    longDoneWhenShortFinished = longDone;
    const longResult = await long;
    // first come, first served would have finished all 40 blocks of the long study first
    expect(longDoneWhenShortFinished).toBeLessThan(longTotal / 2);
    expect(short.trials).toBe(4 * 4096);
    expect(longResult.trials).toBe(longTotal);
  });

  it("replaces a worker that dies, runs its blocks again, and the result does not change", async () => {
    const before = pool.threadsForTest().map((w) => w.threadId);
    let killed = false;
    const r = await pool.run(stack, base, {
      trials: 10 * 4096,
      seed: 21,
      onProgress: (p) => {
        if (!killed && p.trialsDone >= 3 * 4096) {
          killed = true;
          void pool.threadsForTest()[0].terminate();
        }
      },
    });
    expect(killed).toBe(true);
    const after = pool.threadsForTest().map((w) => w.threadId);
    expect(after).toHaveLength(2);
    expect(after[0]).not.toBe(before[0]);
    expect(JSON.stringify(r)).toBe(JSON.stringify(runStudy(stack, base, { trials: 10 * 4096, seed: 21 })));
  });

  it("cancelling one study leaves another one running to its exact result", async () => {
    const ctl = new AbortController();
    const cancelled = pool.run(stack, base, {
      trials: 30 * 4096,
      owner: "carol",
      signal: ctl.signal,
      onProgress: (p) => {
        if (p.trialsDone >= 2 * 4096) ctl.abort();
      },
    });
    const other = pool.run(stack, base, { trials: 5 * 4096, owner: "dave", seed: 8 });
    await expect(cancelled).rejects.toBeInstanceOf(StudyAbortedError);
    expect(JSON.stringify(await other)).toBe(JSON.stringify(runStudy(stack, base, { trials: 5 * 4096, seed: 8 })));
    expect(pool.activeStudies).toBe(0);
  });

  it("runs a live estimate on an engine thread, with the figures of the in-process estimate", async () => {
    const live = liveStudy(stack, base.requirements ?? []);
    expect(live.study.requirements?.length).toBeGreaterThan(0);
    const inProcess = estimate(stack, live);
    expect(await pool.estimate(stack, live)).toEqual(inProcess);
    // the thread it went to dies before answering: asked again on another, the same figures
    const replaced = logs.filter((l) => l.includes("starting a replacement")).length;
    const pending = pool.estimate(stack, live);
    void pool.threadsForTest()[0].terminate();
    expect(await pending).toEqual(inProcess);
    expect(logs.filter((l) => l.includes("starting a replacement")).length).toBe(replaced + 1);
  });

  it("refuses a live estimate once stopped", async () => {
    const stopped = new EnginePool({ threads: 1 });
    await stopped.stop();
    await expect(stopped.estimate(stack, liveStudy(stack, base.requirements ?? []))).rejects.toBeInstanceOf(StudyAbortedError);
  });
});
