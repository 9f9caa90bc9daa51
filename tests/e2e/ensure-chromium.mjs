// Run by `npm test` before vitest: the browser tests drive Debian's chromium through
// playwright-core, which downloads no browser of its own; the report tests read PDFs with
// poppler's pdftotext.
import { execSync } from "node:child_process";
import { existsSync } from "node:fs";

const CHROMIUM = "/usr/bin/chromium";
const PDFTOTEXT = "/usr/bin/pdftotext";
const wanted = [
  { path: CHROMIUM, pkg: "chromium" },
  { path: PDFTOTEXT, pkg: "poppler-utils" },
];
const missing = wanted.filter((w) => !existsSync(w.path));

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

const still = missing.filter((m) => !existsSync(m.path));
if (still.length) {
  console.error(`[ensure-chromium] apt-get finished but ${still.map((m) => m.path).join(", ")} is still missing`);
  process.exit(1);
}
console.log(`[ensure-chromium] installed ${pkgs}`);
