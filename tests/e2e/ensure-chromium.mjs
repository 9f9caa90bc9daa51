// Run by `npm test` before vitest: the browser tests drive Debian's chromium through
// playwright-core, which downloads no browser of its own; the report tests read PDFs with
// poppler's pdftotext; the server-mode backend suite starts a throwaway cluster of Debian's
// postgresql (tests/setup/postgres-cluster.ts).
import { execSync } from "node:child_process";
import { existsSync, readdirSync } from "node:fs";

const CHROMIUM = "/usr/bin/chromium";
const PDFTOTEXT = "/usr/bin/pdftotext";
/** Debian installs the server under /usr/lib/postgresql/<major>/bin. */
function postgresInitdb() {
  const root = "/usr/lib/postgresql";
  if (!existsSync(root)) return undefined;
  const found = readdirSync(root)
    .map((v) => `${root}/${v}/bin/initdb`)
    .find((p) => existsSync(p));
  return found;
}
const present = (w) => (w.find ? w.find() !== undefined : existsSync(w.path));
const wanted = [
  { path: CHROMIUM, pkg: "chromium" },
  { path: PDFTOTEXT, pkg: "poppler-utils" },
  { path: "/usr/lib/postgresql/<major>/bin/initdb", pkg: "postgresql", find: postgresInitdb },
];
const missing = wanted.filter((w) => !present(w));

for (const w of wanted) if (!missing.includes(w)) console.log(`[ensure-chromium] found ${w.path}`);
if (missing.length === 0) process.exit(0);

const pkgs = missing.map((m) => m.pkg).join(" ");
console.log(`[ensure-chromium] ${missing.map((m) => m.path).join(", ")} missing; installing Debian's ${pkgs} with apt-get`);
const asRoot = typeof process.getuid === "function" && process.getuid() === 0;
const sudo = asRoot ? "" : "sudo ";
try {
  for (const cmd of [`${sudo}apt-get update`, `${sudo}apt-get install -y ${pkgs}`]) {
    console.log(`[ensure-chromium] $ ${cmd}`);
    execSync(cmd, { stdio: "inherit", env: { ...process.env, DEBIAN_FRONTEND: "noninteractive" } });
  }
} catch (error) {
  console.error(`[ensure-chromium] installing ${pkgs} failed: ${error instanceof Error ? error.message : String(error)}`);
  process.exit(1);
}

const still = missing.filter((m) => !present(m));
if (still.length) {
  console.error(`[ensure-chromium] apt-get finished but ${still.map((m) => m.path).join(", ")} is still missing`);
  process.exit(1);
}
console.log(`[ensure-chromium] installed ${pkgs}`);
