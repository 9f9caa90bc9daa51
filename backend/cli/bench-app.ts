/** The app as the load scripts see it: `bench-server.ts` in a child process, signed in over HTTP. */
import { spawn, type ChildProcess } from "node:child_process";
import { mkdtempSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { DEMO_PASSWORD } from "../seed";

const root = fileURLToPath(new URL("../../", import.meta.url));

/** The runtime of `npm start` (demo seed, data in a fresh temporary folder) on a free loopback port. */
export async function startServer(): Promise<{ child: ChildProcess; url: string; dir: string; pid: number }> {
  const dir = mkdtempSync(join(tmpdir(), "orthostack-bench-"));
  const child = spawn(join(root, "node_modules/.bin/tsx"), [join(root, "backend/cli/bench-server.ts")], {
    cwd: root,
    env: { ...process.env, DATA_DIR: dir, SEED_DEMO: "true", NODE_ENV: "production", MAIL_CATCHER_PORT: "0" },
    stdio: ["ignore", "pipe", "inherit"],
  });
  // the server's own process (tsx runs it in a child of `child`), for its CPU time
  const { port, pid } = await new Promise<{ port: number; pid: number }>((resolve, reject) => {
    let buf = "";
    child.stdout!.on("data", (d: Buffer) => {
      buf += d.toString();
      const line = buf.split("\n").find((l) => l.startsWith("{"));
      if (line) resolve(JSON.parse(line));
    });
    child.on("exit", (code) => reject(new Error(`bench server exited with ${code}`)));
  });
  return { child, url: `http://127.0.0.1:${port}`, dir, pid };
}

export async function json(url: string, init: RequestInit = {}, cookie = "") {
  const r = await fetch(url, {
    ...init,
    headers: { "content-type": "application/json", origin: new URL(url).origin, cookie, ...(init.headers ?? {}) },
  });
  // eslint-disable-next-line @typescript-eslint/no-explicit-any -- a load script reading a few known fields
  const body = (await r.json().catch(() => null)) as any;
  return { status: r.status, body, headers: r.headers };
}

/** Signs in a demo user and returns the session cookie. */
export async function signIn(url: string, email: string): Promise<string> {
  const res = await fetch(`${url}/api/auth/sign-in/email`, {
    method: "POST",
    headers: { "content-type": "application/json", origin: url },
    body: JSON.stringify({ email, password: DEMO_PASSWORD }),
  });
  if (!res.ok) throw new Error(`sign-in failed: ${res.status}`);
  return res.headers
    .getSetCookie()
    .map((c) => c.split(";")[0])
    .join("; ");
}

/** Waits (up to 5 min) until no project has a study queued or running, such as the demo study the seed queues. */
export async function studiesIdle(url: string, cookie: string) {
  for (let i = 0; i < 600; i++) {
    const projects = await json(`${url}/api/projects`, {}, cookie);
    const lists = await Promise.all(
      (projects.body?.projects ?? projects.body ?? []).map((p: { id: string }) => json(`${url}/api/projects/${p.id}/studies`, {}, cookie)),
    );
    if (!lists.some((l) => /"status":"(queued|running)"/.test(JSON.stringify(l.body)))) return;
    await new Promise((r) => setTimeout(r, 500));
  }
}
