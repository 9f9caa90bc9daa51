/**
 * npm run bench:queue -- [--trials N]: server mode measured on this machine. Starts a throwaway
 * PostgreSQL cluster (Debian's postgresql), the app with DATABASE_URL and RUN_STUDIES=false, and
 * 1 then 2 `npm run worker` processes (one thread each); runs the reference study through the API
 * with each, kills one of the two workers mid-study (kill -9), and compares every result with the
 * in-process runner's for the same files and seed. Prints trials per second and the queue's
 * overhead against the in-process runner on the same thread count.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { readFileSync } from "node:fs";
import { createServer } from "node:net";
import { loadavg } from "node:os";
import { fileURLToPath } from "node:url";
import { isDeepStrictEqual } from "node:util";
import { runStudyOnThreads } from "../engine/runner";
import { validateStackFile } from "@shared/schemas/stack-file";
import { validateStudy } from "@shared/schemas/study-file";
import { startCluster } from "../../tests/setup/postgres-cluster";
import { DEMO_PASSWORD } from "../seed";

const root = fileURLToPath(new URL("../..", import.meta.url));
const fixture = (name: string) => JSON.parse(readFileSync(new URL(`../../tests/fixtures/${name}`, import.meta.url), "utf8"));
const arg = (name: string) => {
  const i = process.argv.indexOf(`--${name}`);
  return i > 0 ? process.argv[i + 1] : undefined;
};
const trials = Number(arg("trials") ?? 1_000_000);
const out = (line: string) => process.stdout.write(line + "\n");

async function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const s = createServer();
    s.listen(0, "127.0.0.1", () => {
      const port = (s.address() as { port: number }).port;
      s.close(() => resolve(port));
    });
  });
}

const children: ChildProcess[] = [];
const start = (script: string, env: Record<string, string>) => {
  const c = spawn(process.execPath, ["--import", "tsx", script], { cwd: root, env: { ...process.env, ...env }, stdio: "ignore" });
  children.push(c);
  return c;
};

const cluster = await startCluster();
try {
  const port = await freePort();
  const url = `http://127.0.0.1:${port}`;
  const common = { DATABASE_URL: cluster.url, STUDY_JOB_EXPIRE_SECONDS: "30", QUEUE_MAINTENANCE_SECONDS: "2" };
  start("backend/server.ts", {
    ...common,
    PORT: String(port),
    HOST: "127.0.0.1",
    RUN_STUDIES: "false",
    NODE_ENV: "production",
    APP_URL: url,
  });
  for (let i = 0; ; i++) {
    const ok = await fetch(`${url}/api/health`)
      .then((r) => r.ok)
      .catch(() => false);
    if (ok) break;
    if (i > 600) throw new Error("the app did not start");
    await new Promise((r) => setTimeout(r, 500));
  }
  const headers = { "content-type": "application/json", origin: url };
  const signIn = await fetch(`${url}/api/auth/sign-in/email`, {
    method: "POST",
    headers,
    body: JSON.stringify({ email: "engineer@example.com", password: DEMO_PASSWORD }),
  });
  const cookie = signIn.headers
    .getSetCookie()
    .map((c) => c.split(";")[0])
    .join("; ");
  const call = async (method: string, path: string, body?: unknown) => {
    const r = await fetch(url + path, {
      method,
      headers: { ...headers, cookie },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
    return (await r.json()) as Record<string, unknown> & { id: string };
  };
  const project = await call("POST", "/api/projects", { name: `Queue bench ${Date.now()}` });
  const stack = fixture("stack-reference.json");
  const revision = await call("POST", `/api/projects/${project.id}/revisions`, { stack });
  const studyFile = { ...fixture("study-reference.json"), trials, seed: 2026 };
  const s = validateStackFile(stack);
  if (!s.ok) throw new Error("reference stack");
  const st = validateStudy(studyFile, s.stack);
  if (!st.ok) throw new Error("reference study");

  const inProcess = async (threads: number) => {
    const t0 = performance.now();
    const result = await runStudyOnThreads(s.stack, st.study, { threads });
    return { seconds: (performance.now() - t0) / 1000, result: JSON.parse(JSON.stringify(result)) };
  };
  const throughQueue = async (workers: number, killOne: boolean) => {
    const ws = Array.from({ length: workers }, () => start("backend/worker.ts", { ...common, WORKER_THREADS: "1" }));
    // let the workers start (tsx, bundle) before the clock runs
    for (let i = 0; i < 600; i++) {
      const h = (await fetch(`${url}/api/health`).then((r) => r.json())) as { queue?: { workers: unknown[] } };
      if ((h.queue?.workers.length ?? 0) >= workers) break;
      await new Promise((r) => setTimeout(r, 250));
    }
    const t0 = performance.now();
    const created = await call("POST", `/api/revisions/${revision.id}/studies`, { study: studyFile });
    let killed = false;
    for (;;) {
      const got = await call("GET", `/api/studies/${created.id}`);
      if (got.status === "finished" || got.status === "failed") {
        const seconds = (performance.now() - t0) / 1000;
        for (const w of ws) w.kill("SIGKILL");
        return { seconds, status: got.status, result: got.result, killed };
      }
      if (killOne && !killed && Number(got.trialsDone) > trials / 3) {
        ws[0].kill("SIGKILL");
        killed = true;
      }
      await new Promise((r) => setTimeout(r, 250));
    }
  };

  out(
    `server mode bench: reference study, ${trials.toLocaleString("en")} trials; load average ${loadavg()
      .map((l) => l.toFixed(2))
      .join(" ")}`,
  );
  const ref1 = await inProcess(1);
  out(`in-process runner, 1 thread:  ${ref1.seconds.toFixed(1)} s, ${(trials / ref1.seconds).toFixed(0)} trials/s`);
  const ref2 = await inProcess(2);
  out(`in-process runner, 2 threads: ${ref2.seconds.toFixed(1)} s, ${(trials / ref2.seconds).toFixed(0)} trials/s`);
  for (const [workers, kill, ref] of [
    [1, false, ref1],
    [2, false, ref2],
    [2, true, ref2],
  ] as const) {
    const q = await throughQueue(workers, kill);
    const same = isDeepStrictEqual(q.result, ref1.result);
    out(
      `queue, ${workers} worker process${workers > 1 ? "es" : ""}${kill ? " (one killed mid-study)" : ""}: ${q.status}, ${q.seconds.toFixed(1)} s, ` +
        `${(trials / q.seconds).toFixed(0)} trials/s, overhead ${((q.seconds / ref.seconds - 1) * 100).toFixed(0)} % against the in-process runner; ` +
        `result ${same ? "identical" : "DIFFERENT"} to the in-process runner's`,
    );
  }
  out(
    `load average after: ${loadavg()
      .map((l) => l.toFixed(2))
      .join(" ")}`,
  );
} finally {
  for (const c of children) c.kill("SIGKILL");
  await cluster.stop();
}
process.exit(0);
