/**
 * npm run bench: the figures of docs/engine.md on the reference stack and study.
 *
 *   engine: CPU per trial (µs) and trials per CPU-second, 10^4 and 10^5 trials from the
 *           command line (a process each, as a person runs it: start to exit, and when the
 *           first and last blocks came back and the result was ready, from `--timings`),
 *           wall time at 10^4, 10^5, 10^6 trials with 1 and 2 threads, peak memory at 10^7
 *           trials, the live estimate's time from an edit to its figures;
 *   API:    GET /api/projects with 50 signed-in clients (autocannon), alone and while a long
 *           study runs: reads per second, p99 latency, failed requests. Measured first, while
 *           the machine is still idle (see main).
 *
 * Options: --quick (10^4 and 10^5 only, no 10^7), --no-what-if, --no-api, --api-only, --api-seconds N (default 10).
 * The machine's load is printed with every figure: wall-clock figures mean little when other
 * processes share the cores, CPU-seconds mean more.
 */
import { spawnSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { cpus, loadavg, tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import autocannon from "autocannon";
import { EnginePool } from "../engine/pool";
import { threadsForTrials } from "../engine/runner";
import { json, signIn, startServer, studiesIdle } from "./bench-app";
import { whatIfFigures } from "./what-if-figures";
import { BLOCK_SIZE, newCoordinator, newWorkerState, prepareStudy, runBlocks, runStudy } from "@shared/engine/study";
import type { StackFile } from "@shared/schemas/stack-file";
import type { StudyFile } from "@shared/schemas/study-file";
import { validateStackFile } from "@shared/schemas/stack-file";
import { validateStudy } from "@shared/schemas/study-file";

const root = fileURLToPath(new URL("../../", import.meta.url));
/**
 * `npm run study` as package.json spells it, without npm: node's flags, then the launcher and
 * its arguments (the command line the bench times is the one people run).
 */
const studyCommand = (() => {
  const script: string = JSON.parse(readFileSync(join(root, "package.json"), "utf8")).scripts.study;
  const [node, ...args] = script.split(/\s+/);
  if (node !== "node" || !args.includes("backend/cli/launch.mjs"))
    throw new Error(`package.json's study script is not "node … backend/cli/launch.mjs study": ${script}`);
  return args.map((a) => (a === "backend/cli/launch.mjs" ? join(root, a) : a));
})();
const fixture = (name: string) => JSON.parse(readFileSync(join(root, "tests/fixtures", name), "utf8"));
const args = process.argv.slice(2);
const quick = args.includes("--quick");
const apiSeconds = Number(args[args.indexOf("--api-seconds") + 1]) || 10;
const out = (line: string) => process.stdout.write(line + "\n");
const load = () => `load ${loadavg()[0].toFixed(1)} on ${cpus().length} cores`;
const fmt = (n: number) => Math.round(n).toLocaleString("en-US");
const threadsLabel = (trials: number) => {
  const n = threadsForTrials(trials);
  return `${n} thread${n > 1 ? "s" : ""}`;
};

async function engine() {
  const stackV = validateStackFile(fixture("stack-reference.json"));
  if (!stackV.ok) throw new Error("reference stack does not validate");
  const studyV = validateStudy(fixture("study-reference.json"), stackV.stack);
  if (!studyV.ok) throw new Error("reference study does not validate");
  const stack = stackV.stack,
    study = studyV.study;

  // in this thread: CPU per trial of the loop alone
  const c0 = process.cpuUsage();
  runStudy(stack, study, { trials: 5 * 4096 });
  const c = process.cpuUsage(c0);
  const us = (c.user + c.system) / (5 * 4096);
  out(
    `CPU per trial, one thread, whole study in process (20,480 trials, JIT warm-up included): ${us.toFixed(1)} µs · ${fmt(1e6 / us)} trials per CPU-second · ${load()}`,
  );
  // issue 15 item 3's figure: the block loop once compiled (three blocks of warm-up, then 25
  // blocks of 4,096), three times, as the VM's speed wanders by 10-20 % from run to run
  const loops = [0, 1, 2].map(() => blockLoopMicros(stack, study)).sort((a, b) => a - b);
  out(
    `CPU per trial, block loop after warm-up (one thread, 25 blocks of 4,096, three runs): median ${loops[1].toFixed(2)} µs · ${fmt(1e6 / loops[1])} trials per CPU-second (runs ${loops.map((x) => x.toFixed(2)).join(", ")} µs) · ${load()}`,
  );

  // the live estimate: an edit compiles the stack and runs 3,000 trials (stack editor's Web Worker)
  const t0 = performance.now();
  runStudy(stack, { ...study, trials: 3000 }, {});
  out(`live estimate (3,000 trials, compile to figures, one thread): ${(performance.now() - t0).toFixed(0)} ms · ${load()}`);

  // issue 15's "from the command line": the study CLI in a process of its own, start to exit
  // (node, not npm run, whose own start adds about half a second); five runs, as the machine's
  // speed varies from one second to the next
  const dir = mkdtempSync(join(tmpdir(), "orthostack-bench-"));
  try {
    for (const trials of [10_000, 100_000]) {
      const walls: number[] = [];
      const phases: number[][] = [];
      for (let i = 0; i < 5; i++) {
        const t = performance.now();
        const run = spawnSync(
          process.execPath,
          [
            ...studyCommand,
            join(root, "tests/fixtures/stack-reference.json"),
            join(root, "tests/fixtures/study-reference.json"),
            "--trials",
            String(trials),
            "--out",
            join(dir, "result.json"),
            "--timings",
          ],
          { encoding: "utf8" },
        );
        walls.push((performance.now() - t) / 1000);
        if (run.status !== 0) throw new Error(`the study command failed: ${run.stderr}`);
        // handed to the engine, first trial started, first block back, last block back, result (ms since process start)
        phases.push(cliTimings(run.stderr));
      }
      const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[2];
      const phase = (k: number) => fmt(median(phases.map((p) => p[k])));
      out(
        `${fmt(trials)} trials from the command line (npm run study without npm, ${threadsLabel(trials)}), process start to exit: median ${median(walls).toFixed(2)} s (runs ${walls.map((w) => w.toFixed(2)).join(", ")}); medians in ms since process start: study handed to the engine ${phase(0)}, first trial started ${phase(1)}, first block back ${phase(2)}, last block back ${phase(3)}, result ${phase(4)} · ${load()}`,
      );
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }

  out("");
  out("trials       threads   wall s   trials/s (wall)   CPU s   trials per CPU-s   peak RSS   load");
  const sizes = quick ? [10_000, 100_000] : [10_000, 100_000, 1_000_000];
  const row = async (trials: number, threads: number) => {
    const t = performance.now();
    const cpu0 = process.cpuUsage();
    const pool = new EnginePool({ threads });
    const r = await pool.run(stack, study, { trials });
    await pool.stop();
    const s = (performance.now() - t) / 1000;
    const cu = process.cpuUsage(cpu0);
    const cpuS = (cu.user + cu.system) / 1e6;
    const rss = process.resourceUsage().maxRSS / 1024;
    out(
      `${fmt(r.trials).padEnd(12)} ${String(threads).padStart(7)} ${s.toFixed(2).padStart(8)} ${fmt(r.trials / s).padStart(17)} ${cpuS.toFixed(2).padStart(7)} ${fmt(r.trials / cpuS).padStart(18)} ${rss.toFixed(0).padStart(7)} MB   ${loadavg()[0].toFixed(1)}`,
    );
  };
  for (const n of sizes) for (const th of [1, 2]) await row(n, th);
  if (!quick) {
    await row(10_000_000, 2);
    out("(peak RSS is of the whole process, worker threads included; it stays bounded: the percentile stores do not grow with the trials)");
  }
}

/** µs of this thread's CPU per trial over 25 blocks of the study, after 3 blocks of warm-up. */
function blockLoopMicros(stack: StackFile, study: StudyFile): number {
  const warm = 3,
    measured = 25;
  const prep = prepareStudy(stack, study, { trials: (warm + measured) * BLOCK_SIZE, seed: 1 });
  const state = newWorkerState(prep);
  const coord = newCoordinator(prep);
  runBlocks(
    prep,
    state,
    Array.from({ length: warm }, (_, b) => b),
    (p) => coord.add(p),
  );
  const c0 = process.cpuUsage();
  runBlocks(
    prep,
    state,
    Array.from({ length: measured }, (_, b) => warm + b),
    (p) => coord.add(p),
  );
  const c = process.cpuUsage(c0);
  return (c.user + c.system) / (measured * BLOCK_SIZE);
}

async function api() {
  const { child, url, dir } = await startServer();
  try {
    const cookie = await signIn(url, "engineer@example.com");
    // let the demo study the seed queued finish first: "alone" means no study running
    await studiesIdle(url, cookie);
    const measure = async (label: string) => {
      const r = await autocannon({ url: `${url}/api/projects`, connections: 50, duration: apiSeconds, headers: { cookie } });
      const failed = r.errors + r.timeouts + r.non2xx;
      out(
        `${label.padEnd(34)} ${fmt(r.requests.average).padStart(7)} reads/s   p99 ${String(r.latency.p99).padStart(5)} ms   failed ${failed} (errors ${r.errors}, timeouts ${r.timeouts}, non-2xx ${r.non2xx})   (${fmt(r.requests.total)} requests, ${load()})`,
      );
      return r.requests.average;
    };
    // A fresh server is slow for its first half minute: V8 tiers up PGlite's WebAssembly and the
    // request path only once they are hot (measured: 246, 340, 382 reads/s in three 10-s runs back to
    // back on an idle machine). A long-running server is what people meet, so warm up first.
    await autocannon({ url: `${url}/api/projects`, connections: 50, duration: 20, headers: { cookie } });
    out("");
    out(`GET /api/projects, 50 signed-in clients, ${apiSeconds} s each (autocannon), after 20 s of the same to warm the server up:`);
    const alone = await measure("alone");
    const p = await json(`${url}/api/projects`, { method: "POST", body: JSON.stringify({ name: "bench" }) }, cookie);
    const rev = await json(
      `${url}/api/projects/${p.body.id}/revisions`,
      { method: "POST", body: JSON.stringify({ stack: fixture("stack-reference.json") }) },
      cookie,
    );

    // issue 15 item 2: a study of 2·10^5 trials as the page runs it, from the POST to its result
    const t0 = performance.now();
    const quickStudy = await json(
      `${url}/api/revisions/${rev.body.id}/studies`,
      { method: "POST", body: JSON.stringify({ study: { ...fixture("study-reference.json"), trials: 200_000 } }) },
      cookie,
    );
    if (quickStudy.status !== 202) throw new Error(`study not queued: ${quickStudy.status} ${JSON.stringify(quickStudy.body)}`);
    let finished: { status: number; body: { status: string } } | undefined;
    while (performance.now() - t0 < 300_000) {
      finished = await json(`${url}/api/studies/${quickStudy.body.id}`, {}, cookie);
      if (!["queued", "running"].includes(finished.body.status)) break;
      await new Promise((r) => setTimeout(r, 50));
    }
    out(
      `a study of 200,000 trials through the API, from POST to its result read back: ${((performance.now() - t0) / 1000).toFixed(2)} s (${finished?.body.status}; the page polls every second, so it shows within a second more) · ${load()}`,
    );
    const st = await json(
      `${url}/api/revisions/${rev.body.id}/studies`,
      { method: "POST", body: JSON.stringify({ study: { ...fixture("study-reference.json"), trials: 5_000_000 } }) },
      cookie,
    );
    if (st.status !== 202) throw new Error(`study not queued: ${st.status} ${JSON.stringify(st.body)}`);
    await new Promise((r) => setTimeout(r, 1000));
    const busy = await measure("while a 5,000,000-trial study runs");
    const s = await json(`${url}/api/studies/${st.body.id}`, {}, cookie);
    out(
      `the study was ${s.body.status} during the measurement (${fmt(s.body.progress?.done ?? 0)} trials done); reads while it ran: ${((100 * busy) / alone).toFixed(0)} % of alone`,
    );
    await json(`${url}/api/studies/${st.body.id}/cancel`, { method: "POST", body: "{}" }, cookie);
  } finally {
    child.kill("SIGTERM");
    await new Promise((r) => child.once("exit", r));
    rmSync(dir, { recursive: true, force: true });
  }
}

/** The four times of `npm run study -- --timings` (handed, first block, last block, result), ms. */
function cliTimings(stderr: string): number[] {
  const line = stderr.split("\n").find((l) => l.startsWith("timings"));
  const nums = line?.match(/[\d,]+(?= ·|$)/g)?.map((n) => Number(n.replace(/,/g, "")));
  if (!nums || nums.length < 5) throw new Error(`no timings from the study command: ${stderr}`);
  return nums.slice(0, 5);
}

async function main() {
  out(`Orthostack bench · Node ${process.version} · ${cpus().length} cores (${cpus()[0]?.model ?? "?"}) · ${load()} at start`);
  // The API first, on a machine that has been idle: after a minute of both cores busy (the 10^7
  // study) this VM answers about a third slower for a while (measured: 335 reads/s "alone" right
  // after an 8·10^6-trial study, 484 after a pause), which is the machine, not the server.
  if (!args.includes("--no-api")) await api();
  if (!args.includes("--api-only")) await engine();
  if (!args.includes("--api-only") && !args.includes("--no-what-if")) {
    out("\nwhat-if runs (issue 12's aim: under 30 s each on 2 cores)");
    await whatIfFigures({ out });
  }
}

main().catch((e) => {
  process.stderr.write(`bench failed: ${e instanceof Error ? e.stack : String(e)}\n`);
  process.exit(1);
});
