// A throwaway PostgreSQL cluster for the server-mode test suite: Debian's `postgresql` package
// (installed by tests/e2e/ensure-chromium.mjs when missing), initdb in a temporary folder, a free
// loopback port, removed after. As root, the server runs as the `postgres` system user, since
// PostgreSQL refuses to run as root.
import { execFileSync, spawn, type ChildProcess } from "node:child_process";
import { chmodSync, chownSync, existsSync, mkdtempSync, readdirSync, rmSync } from "node:fs";
import { createServer } from "node:net";
import { tmpdir } from "node:os";
import { join } from "node:path";

export type Cluster = { url: string; stop: () => Promise<void> };

/** The newest PostgreSQL server binaries installed by Debian, or undefined. */
export function postgresBin(): string | undefined {
  const root = "/usr/lib/postgresql";
  if (!existsSync(root)) return undefined;
  const versions = readdirSync(root)
    .filter((v) => existsSync(join(root, v, "bin", "initdb")))
    .sort((a, b) => Number(b) - Number(a));
  return versions.length ? join(root, versions[0], "bin") : undefined;
}

async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer();
    s.once("error", reject);
    s.listen(0, "127.0.0.1", () => {
      const port = (s.address() as { port: number }).port;
      s.close(() => resolve(port));
    });
  });
}

function systemUser(name: string): { uid: number; gid: number } | undefined {
  try {
    const uid = Number(execFileSync("id", ["-u", name]).toString().trim());
    const gid = Number(execFileSync("id", ["-g", name]).toString().trim());
    return { uid, gid };
  } catch {
    return undefined;
  }
}

async function waitForReady(bin: string, port: number, child: ChildProcess, stderr: () => string): Promise<void> {
  for (let i = 0; i < 300; i++) {
    if (child.exitCode !== null) throw new Error(`postgres exited (${child.exitCode}): ${stderr()}`);
    try {
      execFileSync(join(bin, "pg_isready"), ["-h", "127.0.0.1", "-p", String(port)], { stdio: "ignore" });
      return;
    } catch {
      await new Promise((r) => setTimeout(r, 100));
    }
  }
  throw new Error(`postgres did not become ready on port ${port}: ${stderr()}`);
}

/** Starts a new cluster; the caller stops it (which removes its folder). */
export async function startCluster(): Promise<Cluster> {
  const bin = postgresBin();
  if (!bin) throw new Error("PostgreSQL server binaries not found under /usr/lib/postgresql (apt-get install postgresql)");
  const dir = mkdtempSync(join(tmpdir(), "orthostack-pg-"));
  const data = join(dir, "data");
  const asRoot = typeof process.getuid === "function" && process.getuid() === 0;
  const owner = asRoot ? systemUser("postgres") : undefined;
  if (asRoot && !owner) throw new Error("running as root needs the `postgres` system user (Debian's postgresql package makes it)");
  if (owner) {
    chownSync(dir, owner.uid, owner.gid);
    chmodSync(dir, 0o700);
  }
  const as = owner ? { uid: owner.uid, gid: owner.gid } : {};
  execFileSync(join(bin, "initdb"), ["-D", data, "-U", "postgres", "--auth=trust", "-E", "UTF8", "--no-sync", "--locale=C"], {
    ...as,
    stdio: "ignore",
  });
  const port = await freePort();
  let err = "";
  const child = spawn(
    join(bin, "postgres"),
    [
      "-D",
      data,
      "-p",
      String(port),
      "-k",
      dir,
      "-c",
      "listen_addresses=127.0.0.1",
      "-c",
      "fsync=off",
      "-c",
      "synchronous_commit=off",
      "-c",
      "full_page_writes=off",
      "-c",
      "max_connections=300",
    ],
    { ...as, stdio: ["ignore", "ignore", "pipe"] },
  );
  child.stderr?.on("data", (d: Buffer) => {
    err = (err + d.toString()).slice(-4000);
  });
  await waitForReady(bin, port, child, () => err);
  const stop = async () => {
    if (child.exitCode === null) {
      const exited = new Promise((r) => child.once("exit", r));
      child.kill("SIGINT"); // fast shutdown
      await Promise.race([exited, new Promise((r) => setTimeout(r, 10_000))]);
      if (child.exitCode === null) child.kill("SIGKILL");
    }
    rmSync(dir, { recursive: true, force: true });
  };
  return { url: `postgres://postgres@127.0.0.1:${port}/postgres`, stop };
}
