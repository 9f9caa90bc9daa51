/**
 * npm run bench:what-if: only the what-if figures of `npm run bench` (backend/cli/what-if-figures.ts).
 * Options: --trials N (default 100000), --threads N (default 2).
 */
import { whatIfFigures } from "./what-if-figures";

const args = process.argv.slice(2);
const opt = (name: string, d: number) => (args.includes(name) ? Number(args[args.indexOf(name) + 1]) || d : d);

whatIfFigures({ trials: opt("--trials", 100_000), threads: opt("--threads", 2), out: (line) => process.stdout.write(line + "\n") }).catch(
  (e) => {
    process.stderr.write(`${e instanceof Error ? e.stack : String(e)}\n`);
    process.exit(1);
  },
);
