/**
 * npm run study -- STACK.json STUDY.json --out RESULT.json [--threads N] [--trials N] [--seed S] [--timings]
 *
 * Writes the result file (MODEL.md section 11) and prints a short summary. --timings adds one
 * line on stderr: when the study was handed to the engine, its first trial started on an engine
 * thread, the first and the last block came back and the result was written, in ms since the
 * process started (what `npm run bench` reports of a command-line study). A file that
 * does not validate gives the same field messages as the API, on stderr, exit code 2.
 */
import { readFileSync, writeFileSync } from "node:fs";
import { runStudyOnThreads, startStudyThreads, threadsForTrials } from "../engine/runner";
import type { FieldError } from "@shared/schemas/stack-file";
import type { ResultFile } from "@shared/schemas/result-file";

const USAGE = "usage: npm run study -- STACK.json STUDY.json --out RESULT.json [--threads N] [--trials N] [--seed S] [--timings]";

function fail(lines: string[], code = 2): never {
  for (const l of lines) process.stderr.write(l + "\n");
  process.exit(code);
}

function parseArgs(argv: string[]) {
  const pos: string[] = [];
  const opt: Record<string, string> = {};
  let timings = false;
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (a === "--timings") timings = true;
    else if (a.startsWith("--")) {
      const [k, inline] = a.slice(2).split("=", 2);
      if (!["out", "threads", "trials", "seed"].includes(k)) fail([`unknown option --${k}`, USAGE]);
      const v = inline ?? argv[++i];
      if (v === undefined) fail([`--${k} needs a value`, USAGE]);
      opt[k] = v;
    } else pos.push(a);
  }
  if (pos.length !== 2 || !opt.out) fail([USAGE]);
  const int = (k: string, lo: number, hi: number) => {
    if (opt[k] === undefined) return undefined;
    const n = Number(opt[k]);
    if (!Number.isInteger(n) || n < lo || n > hi) fail([`--${k} must be a whole number from ${lo} to ${hi}, got ${opt[k]}`]);
    return n;
  };
  return {
    stackPath: pos[0],
    studyPath: pos[1],
    out: opt.out,
    threads: int("threads", 1, 256),
    // at most MAX_TRIALS: checked once the schemas are loaded (main)
    trials: int("trials", 1, Number.MAX_SAFE_INTEGER),
    seed: int("seed", 0, Number.MAX_SAFE_INTEGER),
    timings,
  };
}

function readJson(path: string, what: string): unknown {
  let text: string;
  try {
    text = readFileSync(path, "utf8");
  } catch (e) {
    fail([`${what} ${path}: cannot be read (${(e as NodeJS.ErrnoException).code ?? String(e)})`]);
  }
  try {
    return JSON.parse(text);
  } catch (e) {
    fail([`${what} ${path}: not valid JSON (${(e as Error).message})`]);
  }
}

function report(what: string, path: string, issues: FieldError[]): never {
  fail([`${what} ${path} is not valid:`, ...issues.map((i) => `  ${i.path || "(file)"}: ${i.message}`)]);
}

const f = (v: number, d = 4) => (Number.isFinite(v) ? v.toFixed(d) : String(v));

export function summary(r: ResultFile, seconds: number, threads: number): string {
  const out: string[] = [];
  out.push(
    `${r.engine} · ${r.trials.toLocaleString("en-US")} trials · seed ${r.seed} · ${r.sampling} · calibration ${r.calibration} · ${threads} thread${threads > 1 ? "s" : ""} · ${seconds.toFixed(2)} s (${Math.round(r.trials / seconds).toLocaleString("en-US")} trials/s)`,
  );
  if (r.adaptive)
    out.push(
      `adaptive (JCGM 101 7.9): ${r.adaptive.runs} runs of ${r.adaptive.runTrials} trials, ${r.adaptive.converged ? "stable" : "NOT stable within the trial limit"}`,
    );
  if (r.requirements.length) {
    out.push("", "requirement                         limit   target  predicted  95% CI (Wilson)        ppm out   ");
    for (const q of r.requirements) {
      out.push(
        `${q.metric.padEnd(34)} ${f(q.max, 3).padStart(7)} ${f(q.yield, 4).padStart(8)} ${f(q.predictedYield, 5).padStart(10)}  [${f(q.ci[0], 5)}, ${f(q.ci[1], 5)}] ${Math.round(q.ppmOut).toString().padStart(9)}  ${q.passes ? "PASS" : "FAIL"}`,
      );
    }
  }
  // the requirement metrics and the compass; every metric is in the result file
  const shown = new Set([...r.requirements.map((q) => q.metric), "heading.maxAbsDeg", "heading.rmsDeg"]);
  out.push("", "metric                                   mean      std      p50      p95   p99.73      max");
  for (const [id, m] of Object.entries(r.metrics)) {
    if (!shown.has(id)) continue;
    out.push(
      `${(id + " (" + m.unit + ")").padEnd(38)} ${[m.mean, m.std, m.p50, m.p95, m.p9973, m.max].map((v) => f(v).padStart(8)).join(" ")}`,
    );
  }
  const rest = Object.keys(r.metrics).length - [...shown].filter((id) => id in r.metrics).length;
  if (rest > 0) out.push(`(${rest} more metrics in the result file; percentiles are of |value|)`);
  return out.join("\n");
}

async function main() {
  // `npm run study … | head`: a reader that stops early is not a failure of the study
  process.stdout.on("error", (e: NodeJS.ErrnoException) => {
    if (e.code === "EPIPE") process.exit(0);
    throw e;
  });
  const args = parseArgs(process.argv.slice(2));
  const stackJson = readJson(args.stackPath, "stack file");
  const studyJson = readJson(args.studyPath, "study file");
  // Unless told, as many threads as the study's size pays for (one for a small study), from
  // the trials the file declares. They start before the schemas load (a dynamic import: the
  // bundle evaluates zod's schemas only then) and the files are validated, which their start
  // (about 0.1 s) overlaps; a file that does not validate ends the process, threads and all.
  const declared = (studyJson as { trials?: unknown } | null)?.trials;
  const threads =
    args.threads ??
    threadsForTrials(args.trials ?? (Number.isSafeInteger(declared) && (declared as number) > 0 ? (declared as number) : 1));
  const pool = startStudyThreads(threads);
  const { validateStackFile } = await import("@shared/schemas/stack-file");
  const { validateStudy, MAX_TRIALS } = await import("@shared/schemas/study-file");
  if (args.trials !== undefined && args.trials > MAX_TRIALS)
    fail([`--trials must be a whole number from 1 to ${MAX_TRIALS}, got ${args.trials}`]);
  const stackV = validateStackFile(stackJson);
  if (!stackV.ok) report("stack file", args.stackPath, stackV.issues);
  const studyV = validateStudy(studyJson, stackV.stack);
  if (!studyV.ok) report("study file", args.studyPath, studyV.issues);
  const t0 = performance.now();
  let lastPct = -1;
  // ms since the process started (performance.timeOrigin)
  let firstTrialAt = NaN,
    firstBlockAt = NaN,
    lastBlockAt = NaN;
  const result = await runStudyOnThreads(stackV.stack, studyV.study, {
    pool,
    trials: args.trials,
    seed: args.seed,
    onProgress: ({ trialsDone, trialsTotal, firstTrialAt: started }) => {
      if (Number.isNaN(firstBlockAt)) firstBlockAt = performance.now();
      if (started !== undefined) firstTrialAt = started - performance.timeOrigin;
      lastBlockAt = performance.now();
      const pct = Math.floor((100 * trialsDone) / trialsTotal / 10) * 10;
      if (pct > lastPct && process.stderr.isTTY) {
        lastPct = pct;
        process.stderr.write(`\r${pct}% `);
      }
    },
  });
  const resultAt = performance.now();
  const seconds = (resultAt - t0) / 1000;
  if (process.stderr.isTTY) process.stderr.write("\r");
  writeFileSync(args.out, JSON.stringify(result, null, 1) + "\n");
  process.stdout.write(summary(result, seconds, threads) + "\n");
  process.stdout.write(`\nwrote ${args.out}\n`);
  if (args.timings) {
    const ms = (t: number) => Math.round(t).toLocaleString("en-US");
    process.stderr.write(
      `timings (ms since the process started): study handed to the engine ${ms(t0)} · first trial started ${ms(firstTrialAt)} · first block back ${ms(firstBlockAt)} · last block back ${ms(lastBlockAt)} · result ${ms(resultAt)} · written ${ms(performance.now())}\n`,
    );
  }
}

main().catch((e) => fail([`study failed: ${e instanceof Error ? e.message : String(e)}`], 1));
