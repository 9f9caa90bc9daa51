// `npm run study` / `npm run bench`: runs the command-line tool from its plain-JS bundle
// (rebuilt only when a source changed), so the process starts without a TypeScript loader.
// `npm run study` starts node with --no-concurrent-recompilation (package.json): the process
// does nothing but the study, so its own thread, like the engine threads, compiles a hot
// function at once instead of waiting for a background compiler thread that the two engine
// threads leave little room (the result's statistics ~30 ms sooner; docs/engine.md).
import { pathToFileURL } from "node:url";
import { ensureBundle } from "../engine/bundle.mjs";

const [name, ...rest] = process.argv.slice(2);
if (name !== "study" && name !== "bench") {
  process.stderr.write("usage: node backend/cli/launch.mjs study|bench [arguments]\n");
  process.exit(2);
}
process.argv = [process.argv[0], process.argv[1], ...rest];
await import(pathToFileURL(ensureBundle(name)).href);
