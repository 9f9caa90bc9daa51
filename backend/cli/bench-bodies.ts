/**
 * npm run bench:bodies: what the largest request bodies cost the server. Starts the app as
 * `npm run bench` does, then sends each body of tests/backend/security/large-bodies.ts (the
 * largest the schema's limits admit, the checks across elements at their worst, and bodies just
 * beyond the limits) several times as a PATCH of a draft revision, once the demo study the seed
 * queues has finished, while another client asks GET /api/health every 20 ms. Prints each body's
 * worst and median request time, the health latency meanwhile (aim: worst body < 500 ms, health
 * < 100 ms) and the machine's load, and the CPU time the server's main thread (the event loop,
 * where PGlite runs too) spent while each request ran: on a shared machine the wall-clock figures
 * grow with the load, that one much less.
 *
 * Options: --repeat N (default 5).
 */
import { existsSync, readFileSync, rmSync } from "node:fs";
import { cpus, loadavg } from "node:os";
import { json, signIn, startServer, studiesIdle } from "./bench-app";
import { revisionBodies } from "../../tests/backend/security/large-bodies";

const out = (line: string) => process.stdout.write(line + "\n");
const load = () =>
  `load ${loadavg()
    .map((l) => l.toFixed(2))
    .join(" ")} on ${cpus().length} cores`;
const repeat = Number(process.argv[process.argv.indexOf("--repeat") + 1]) || 5;
const reference = JSON.parse(readFileSync(new URL("../../tests/fixtures/stack-reference.json", import.meta.url), "utf8"));

/** GET /api/health every `everyMs` until stopped; the latencies seen. */
function healthProbe(url: string, everyMs = 20) {
  const seen: number[] = [];
  let failed = 0;
  let running = true;
  const loop = (async () => {
    while (running) {
      const t0 = performance.now();
      // a refused or reset connection counts as a failed probe, not the end of the run
      const ok = await fetch(`${url}/api/health`)
        .then((r) => r.arrayBuffer().then(() => r.ok))
        .catch(() => false);
      if (ok) seen.push(performance.now() - t0);
      else failed++;
      await new Promise((r) => setTimeout(r, everyMs));
    }
  })();
  return {
    stop: async () => {
      running = false;
      await loop;
      return { seen, failed };
    },
  };
}

/** CPU time of a process's main thread so far, in ms (Linux: /proc/PID/schedstat); null elsewhere. */
function mainThreadCpuMs(pid: number): number | null {
  const file = `/proc/${pid}/schedstat`;
  return existsSync(file) ? Number(readFileSync(file, "utf8").split(" ")[0]) / 1e6 : null;
}

const ms = (v: number) => `${Math.round(v)} ms`;
const pct = (xs: number[], p: number) => [...xs].sort((a, b) => a - b)[Math.min(xs.length - 1, Math.floor(p * xs.length))] ?? 0;

async function main() {
  out(`Orthostack bench:bodies · Node ${process.version} · ${cpus().length} cores · ${load()} at start`);
  const { child, url, dir, pid } = await startServer();
  try {
    const cookie = await signIn(url, "engineer@example.com");
    // the demo study the seed queues folds its results on the main thread: measured bodies alone
    await studiesIdle(url, cookie);
    const p = await json(`${url}/api/projects`, { method: "POST", body: JSON.stringify({ name: "bench bodies" }) }, cookie);
    if (p.status !== 201) throw new Error(`project not created: ${p.status}`);
    const draft = async () => {
      const r = await json(
        `${url}/api/projects/${p.body.id}/revisions`,
        { method: "POST", body: JSON.stringify({ stack: reference }) },
        cookie,
      );
      if (r.status !== 201) throw new Error(`revision not created: ${r.status}`);
      return r;
    };
    out(`PATCH /api/revisions/:id, each body ${repeat} times, GET /api/health every 20 ms meanwhile:`);
    out(`${"body".padEnd(78)} ${"KiB".padStart(5)} status  worst   median   server CPU median   health p50 / max`);
    let worstAll = 0;
    const healthAll: number[] = [];
    let healthFailed = 0;
    for (const c of revisionBodies(reference)) {
      const text = JSON.stringify(c.body);
      const times: number[] = [];
      const cpu: number[] = [];
      const statuses = new Set<number>();
      const probe = healthProbe(url);
      for (let i = 0; i < repeat; i++) {
        const rev = await draft();
        const etag = rev.headers.get("etag");
        const body = typeof rev.body.version === "number" ? JSON.stringify({ ...(c.body as object), version: rev.body.version }) : text;
        const c0 = mainThreadCpuMs(pid);
        const t0 = performance.now();
        const r = await json(
          `${url}/api/revisions/${rev.body.id}`,
          { method: "PATCH", body, headers: etag ? { "if-match": etag } : {} },
          cookie,
        );
        times.push(performance.now() - t0);
        const c1 = mainThreadCpuMs(pid);
        if (c0 !== null && c1 !== null) cpu.push(c1 - c0);
        statuses.add(r.status);
      }
      const { seen: health, failed } = await probe.stop();
      healthFailed += failed;
      healthAll.push(...health);
      worstAll = Math.max(worstAll, ...times);
      out(
        `${c.label.padEnd(78)} ${String(Math.round(text.length / 1024)).padStart(5)} ${[...statuses].join("/").padStart(6)}  ${ms(Math.max(...times)).padStart(7)}  ${ms(pct(times, 0.5)).padStart(7)}  ${(cpu.length ? ms(pct(cpu, 0.5)) : "–").padStart(17)}   ${ms(pct(health, 0.5))} / ${ms(Math.max(...health))}`,
      );
    }
    out(
      `worst request ${ms(worstAll)}; /api/health p50 ${ms(pct(healthAll, 0.5))}, p99 ${ms(pct(healthAll, 0.99))}, max ${ms(Math.max(...healthAll))} (${healthAll.length} probes, ${healthFailed} failed); ${load()} at end`,
    );
  } finally {
    child.kill("SIGTERM");
    await new Promise((r) => child.once("exit", r));
    rmSync(dir, { recursive: true, force: true });
  }
}

main().catch((e) => {
  process.stderr.write(`bench:bodies failed: ${e instanceof Error ? e.stack : String(e)}\n`);
  process.exit(1);
});
