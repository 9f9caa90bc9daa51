import { existsSync, readdirSync, statSync } from "node:fs";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import express, { type Express } from "express";

const root = fileURLToPath(new URL("..", import.meta.url));
const distDir = join(root, "dist", "client");
const fontsDir = join(root, "fonts");

function newestMtime(dir: string): number {
  let newest = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, entry.name);
    newest = Math.max(newest, entry.isDirectory() ? newestMtime(p) : statSync(p).mtimeMs);
  }
  return newest;
}

/** True when there is no client build or a source file is newer than it. */
function buildIsStale(): boolean {
  const index = join(distDir, "index.html");
  if (!existsSync(index)) return true;
  const built = statSync(index).mtimeMs;
  return ["frontend", "shared"].some((d) => existsSync(join(root, d)) && newestMtime(join(root, d)) > built);
}

export async function buildClientIfNeeded(log: (m: string) => void) {
  if (!buildIsStale()) return;
  log("building the client (first start or sources changed)…");
  const { build } = await import("vite");
  await build({ configFile: join(root, "vite.config.ts"), logLevel: "warn" });
}

const fonts = (app: Express) => app.use("/fonts", express.static(fontsDir, { immutable: true, maxAge: "365d", fallthrough: false }));

/** Production: the built client, with the single-page fallback. */
export function mountStaticClient(app: Express) {
  fonts(app);
  app.use(express.static(distDir, { index: false, maxAge: "1h" }));
  app.get("/{*splat}", (_req, res) => {
    res.sendFile(join(distDir, "index.html"));
  });
}

/** Development: Vite in middleware mode inside this process (one port, one origin). */
export async function mountDevClient(app: Express) {
  const { createServer } = await import("vite");
  const vite = await createServer({ configFile: join(root, "vite.config.ts"), server: { middlewareMode: true }, appType: "spa" });
  fonts(app);
  app.use(vite.middlewares);
}
