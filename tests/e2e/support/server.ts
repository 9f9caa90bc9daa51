import { spawn, type ChildProcess } from "node:child_process";
import { cpSync, mkdtempSync, rmSync } from "node:fs";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { inject } from "vitest";

const ROOT = fileURLToPath(new URL("../../..", import.meta.url));

export type RunningServer = { baseURL: string; stop: () => Promise<void>; output: () => string };

async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer();
    probe.unref();
    probe.on("error", reject);
    probe.listen(0, "127.0.0.1", () => {
      const address = probe.address();
      const port = typeof address === "object" && address ? address.port : 0;
      probe.close(() => resolve(port));
    });
  });
}

async function waitForHealth(baseURL: string, child: ChildProcess, output: () => string, timeoutMs: number) {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (child.exitCode !== null) throw new Error(`server exited with code ${child.exitCode}:\n${output()}`);
    try {
      const res = await fetch(`${baseURL}/api/health`);
      if (res.ok) return;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`server did not answer /api/health within ${timeoutMs} ms:\n${output()}`);
}

/**
 * The real server, as `npm start` runs it, on a free port with a data folder of its own (a copy
 * of the run's seeded demo) and the built client from dist/client.
 */
export async function startServer(): Promise<RunningServer> {
  const port = await freePort();
  const dataDir = mkdtempSync(join(tmpdir(), "orthostack-e2e-"));
  // The run's seeded data folder (tests/setup/e2e-data.ts); without it the server seeds its own.
  const seeded = inject("e2eSeededDataDir");
  if (seeded) cpSync(seeded, dataDir, { recursive: true });
  // The address better-auth and the invitation links use; the browser must use the same origin.
  const baseURL = `http://localhost:${port}`;
  // Vitest puts Vite's import.meta.env values (BASE_URL="/", MODE, DEV, PROD, SSR) and its
  // own VITEST* flags into process.env; the server must start as `npm start` would.
  const env: NodeJS.ProcessEnv = {};
  for (const [key, value] of Object.entries(process.env)) {
    if (["BASE_URL", "MODE", "DEV", "PROD", "SSR", "NODE_ENV"].includes(key) || key.startsWith("VITEST")) continue;
    env[key] = value;
  }
  let log = "";
  // node with tsx's loader, as `npm start` runs it, without npx and tsx's own wrapper process.
  const child = spawn(process.execPath, ["--import", "tsx", "backend/server.ts"], {
    cwd: ROOT,
    // Own process group, so stopping it also stops anything the server starts.
    detached: true,
    stdio: ["ignore", "pipe", "pipe"],
    env: {
      ...env,
      PORT: String(port),
      DATA_DIR: dataDir,
      NODE_ENV: "production",
      // One file signs in more often than a person would in a minute.
      SIGN_IN_PER_MINUTE: "200",
    },
  });
  child.stdout?.on("data", (d) => (log += d));
  child.stderr?.on("data", (d) => (log += d));
  const output = () => log;

  const stop = async () => {
    if (child.exitCode === null && child.pid) {
      const exited = new Promise<void>((resolve) => child.once("exit", () => resolve()));
      try {
        process.kill(-child.pid, "SIGTERM");
      } catch {
        // already gone
      }
      const timer = setTimeout(() => {
        try {
          if (child.pid) process.kill(-child.pid, "SIGKILL");
        } catch {
          // already gone
        }
      }, 5000);
      await exited;
      clearTimeout(timer);
    }
    rmSync(dataDir, { recursive: true, force: true });
  };

  try {
    await waitForHealth(baseURL, child, output, 150_000);
  } catch (error) {
    await stop();
    throw error;
  }
  return { baseURL, stop, output };
}
