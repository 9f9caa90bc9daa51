/**
 * The what-if figures of docs/engine.md on the reference stack and study (issue 12's aim: under
 * 30 s each on 2 cores), printed by `npm run bench` and by `npm run bench:what-if` alone:
 *
 *   sweep:      11 values of the magnetometer's axis tolerance (mag.axis), one seed;
 *   allocation: every source free, default costs and bounds, each verifying run at `trials`.
 *
 * Both on a warm pool of engine threads (the server's pool, made once). Wall time, CPU time of
 * the whole process (all threads) and the machine's load are printed with every figure.
 */
import { readFileSync } from "node:fs";
import { cpus, loadavg } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { EnginePool } from "../engine/pool";
import { poolExecutor } from "../services/what-if-queue";
import { validateStackFile } from "@shared/schemas/stack-file";
import { validateStudy } from "@shared/schemas/study-file";
import { describeParameter } from "@shared/whatif/parameters";
import { runSweep } from "@shared/whatif/sweep";
import { runAllocation } from "@shared/whatif/allocation";

const root = fileURLToPath(new URL("../../", import.meta.url));
const fixture = (name: string) => JSON.parse(readFileSync(join(root, "tests/fixtures", name), "utf8"));
const load = () =>
  `load ${loadavg()
    .map((l) => l.toFixed(1))
    .join(" / ")} (1/5/15 min) on ${cpus().length} cores`;

async function timed<T>(out: (line: string) => void, what: string, f: () => Promise<T>): Promise<T> {
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  const r = await f();
  const wall = (performance.now() - t0) / 1000;
  const c = process.cpuUsage(c0);
  out(`${what}: ${wall.toFixed(1)} s wall · ${((c.user + c.system) / 1e6).toFixed(1)} s CPU · ${load()}`);
  return r;
}

export async function whatIfFigures({
  trials = 100_000,
  threads = 2,
  out,
}: {
  trials?: number;
  threads?: number;
  out: (line: string) => void;
}) {
  const stackV = validateStackFile(fixture("stack-reference.json"));
  if (!stackV.ok) throw new Error("reference stack does not validate");
  const studyV = validateStudy({ ...fixture("study-reference.json"), trials }, stackV.stack);
  if (!studyV.ok) throw new Error("reference study does not validate");
  const stack = stackV.stack,
    study = studyV.study;
  const pool = new EnginePool({ threads });
  const execute = poolExecutor(pool)("bench");
  try {
    await pool.run(stack, study, { trials: 4096 }); // warm: threads started, bundle loaded
    out(`reference stack and study, ${trials.toLocaleString("en-US")} trials per run, ${threads} engine threads, seed ${study.seed}`);

    const info = describeParameter(stack, study, "mag.axis");
    if ("error" in info) throw new Error(info.error);
    const values = Array.from({ length: 11 }, (_, i) => Math.round((0.2 + 0.1 * i) * 100) / 100);
    const sweep = await timed(out, `sweep of mag.axis over 11 values (${values[0]}–${values[10]}°)`, () =>
      runSweep({ stack, study, info, values, execute }),
    );
    for (const c of sweep.crossings)
      out(`  ${c.metric} meets its target at mag.axis ${c.value === null ? "— (never in range)" : `±${c.value.toFixed(3)}°`}`);

    const alloc = await timed(out, "allocation with Monte Carlo verification", () => runAllocation({ stack, study, execute }));
    out(
      `  ${alloc.verified ? "verified" : "NOT verified"} in ${alloc.rounds.length - 1} rounds after today's run; cost ${alloc.totalCostCurrent.toFixed(3)} → ${alloc.totalCostProposed.toFixed(3)}`,
    );
    for (const r of alloc.requirements)
      out(`  ${r.metric}: yield ${r.predictedYield.toFixed(5)} [${r.ci[0].toFixed(5)}, ${r.ci[1].toFixed(5)}] target ${r.yield}`);
  } finally {
    await pool.stop();
  }
}
