// `npm run study` / `npm run bench`: runs the command-line tool from its plain-JS bundle
// (rebuilt only when a source changed), so the process starts without a TypeScript loader.
import { pathToFileURL } from "node:url";
import { ensureBundle } from "../engine/bundle.mjs";

const [name, ...rest] = process.argv.slice(2);
if (name !== "study" && name !== "bench") {
  process.stderr.write("usage: node backend/cli/launch.mjs study|bench [arguments]\n");
  process.exit(2);
}
process.argv = [process.argv[0], process.argv[1], ...rest];
await import(pathToFileURL(ensureBundle(name)).href);
