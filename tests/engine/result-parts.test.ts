// The result's model parts (shared/engine/result-parts.ts): an engine thread computes them at
// the end of a study (backend/engine/pool.ts) while the pool's own thread counts percentiles,
// so the numbers that cross the thread must be the in-process ones to the bit, pseudo-inverse
// included.
import { pathToFileURL } from "node:url";
import { Worker } from "node:worker_threads";
import { afterAll, describe, expect, it } from "vitest";
import { ensureBundle } from "@backend/engine/bundle.mjs";
import type { FromWorker, ToWorker } from "@backend/engine/worker";
import { newCoordinator, prepareStudy, type BlockPartial } from "@shared/engine/study";
import { partsInput, resultParts, unpackParts, type ResultParts } from "@shared/engine/result-parts";
import { fixture, referenceStack, studyOf } from "./helpers";

const stack = referenceStack();
const study = studyOf(fixture("study-reference.json"), stack);
const worker = new Worker(pathToFileURL(ensureBundle("worker")), { workerData: {} });
afterAll(() => worker.terminate());

function next(type: FromWorker["type"]): Promise<FromWorker> {
  return new Promise((resolve) => {
    const on = (m: FromWorker) => {
      if (m.type !== type && m.type !== "error") return;
      worker.off("message", on);
      resolve(m);
    };
    worker.on("message", on);
  });
}

describe("result parts from an engine thread", () => {
  it("are the in-process parts to the bit: linearised contributions and the regression's pseudo-inverse", async () => {
    const overrides = { trials: 3 * 4096, seed: 5 };
    const prep = prepareStudy(stack, study, overrides);
    const coord = newCoordinator(prep);
    worker.postMessage({ type: "open", job: 1, stack, study, overrides } satisfies ToWorker);
    for (let b = 0; b < prep.plan.blocks; b++) {
      const got = next("block");
      worker.postMessage({ type: "run", job: 1, block: b } satisfies ToWorker);
      const m = await got;
      if (m.type !== "block") throw new Error(JSON.stringify(m));
      coord.add(m.partial as BlockPartial);
    }
    const input = partsInput(coord);
    const state = next("state");
    const parts = next("parts");
    worker.postMessage({ type: "finish", job: 1, parts: input } satisfies ToWorker);
    expect((await state).type).toBe("state");
    const m = await parts;
    if (m.type !== "parts" || !m.parts) throw new Error(`no parts: ${JSON.stringify(m)}`);
    const there: ResultParts = unpackParts(m.parts);
    const here = resultParts(prep, input);
    // the reference study regresses its requirement metrics on the squared design
    expect(here.designs.squared).not.toBeNull();
    expect(there.designs.squared!.pinv.to2DArray()).toEqual(here.designs.squared!.pinv.to2DArray());
    expect(Array.from(there.designs.squared!.sd)).toEqual(Array.from(here.designs.squared!.sd));
    expect(there.designs.linear).toEqual(here.designs.linear);
    expect(there.lin.map((l) => ({ ...l, slopes: Array.from(l.slopes) }))).toEqual(
      here.lin.map((l) => ({ ...l, slopes: Array.from(l.slopes) })),
    );
  });
});
