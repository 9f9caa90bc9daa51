// Bundles the engine's entry points (the worker thread, the command-line tools) to plain
// JavaScript with esbuild, so no thread and no CLI transpiles TypeScript at start. Plain JS
// itself, because the CLI launcher runs it before anything is compiled.
//
// A bundle is rebuilt when it is missing or any file it was built from is newer (esbuild's
// metafile lists them), so a fresh clone, `npm start` and `npm test` need no build step, and
// an edited engine file is picked up by the next run. Bundles go to dist/engine/, two levels
// below the root like backend/engine/, so `new URL("../../", import.meta.url)` is the root
// from either place.
import { existsSync, mkdirSync, readFileSync, renameSync, statSync, writeFileSync } from "node:fs";
import { createRequire } from "node:module";
import { join } from "node:path";
import { fileURLToPath } from "node:url";

export const ROOT = fileURLToPath(new URL("../../", import.meta.url));
export const BUNDLE_DIR = join(ROOT, "dist/engine");

/** name -> entry file (relative to the root) */
export const ENTRIES = {
  worker: "backend/engine/worker.ts",
  study: "backend/cli/study.ts",
  bench: "backend/cli/bench.ts",
  // not the engine's, but made the same way: the thread that renders report files
  report: "backend/services/report-render-thread.ts",
};

/**
 * Packages bundled into an entry instead of loaded from node_modules: the command-line runner
 * starts about 0.15 s sooner with zod and ml-matrix in its one file (Node reads, resolves and
 * links a hundred small module files otherwise). Only where no other package shares them: the
 * bench loads the whole server, whose packages use zod themselves, so it keeps them external.
 */
const INLINE = {
  study: ["zod", "ml-matrix"],
  // the worker computes the result's regression designs (shared/engine/result-parts.ts)
  worker: ["ml-matrix"],
};

/** esbuild's external list: every dependency of the project but those inlined. */
function externals(inline) {
  const pkg = JSON.parse(readFileSync(join(ROOT, "package.json"), "utf8"));
  const names = Object.keys({ ...pkg.dependencies, ...pkg.devDependencies }).filter((n) => !inline.includes(n));
  return names.flatMap((n) => [n, `${n}/*`]);
}

function isFresh(out, meta) {
  if (!existsSync(out) || !existsSync(meta)) return false;
  let inputs;
  try {
    inputs = JSON.parse(readFileSync(meta, "utf8"));
  } catch {
    return false;
  }
  const built = statSync(out).mtimeMs;
  for (const f of inputs) {
    const p = join(ROOT, f);
    if (!existsSync(p) || statSync(p).mtimeMs > built) return false;
  }
  return true;
}

/**
 * The path of the bundle `name`, built first when stale. Safe when several processes build
 * at once: each writes its own temporary file and renames it into place.
 * @param {keyof typeof ENTRIES} name
 * @returns {string}
 */
export function ensureBundle(name) {
  const out = join(BUNDLE_DIR, `${name}.mjs`);
  const meta = join(BUNDLE_DIR, `${name}.inputs.json`);
  if (isFresh(out, meta)) return out;
  mkdirSync(BUNDLE_DIR, { recursive: true });
  // loaded only when a build is needed: a fresh bundle costs a few stat calls
  const { buildSync } = createRequire(import.meta.url)("esbuild");
  const tmp = `${out}.${process.pid}.${Math.random().toString(36).slice(2)}.tmp`;
  const r = buildSync({
    absWorkingDir: ROOT,
    entryPoints: [ENTRIES[name]],
    outfile: tmp,
    bundle: true,
    platform: "node",
    format: "esm",
    target: "node20",
    ...(INLINE[name] ? { external: externals(INLINE[name]) } : { packages: "external" }),
    tsconfig: join(ROOT, "tsconfig.json"),
    metafile: true,
    logLevel: "silent",
    legalComments: "none",
  });
  const inputs = Object.keys(r.metafile.inputs).filter((f) => !f.includes("node_modules"));
  // an inlined package changes with the lockfile (npm install, npm ci); this file decides
  // what a bundle holds
  if (INLINE[name]) inputs.push("package-lock.json");
  inputs.push("backend/engine/bundle.mjs");
  renameSync(tmp, out);
  const metaTmp = `${meta}.${process.pid}.tmp`;
  writeFileSync(metaTmp, JSON.stringify(inputs));
  renameSync(metaTmp, meta);
  return out;
}
