// Run by `npm test` before vitest: the browser tests drive Debian's chromium through
// playwright-core, which downloads no browser of its own.
import { execSync } from "node:child_process";
import { existsSync } from "node:fs";

const CHROMIUM = "/usr/bin/chromium";

if (existsSync(CHROMIUM)) {
  console.log(`[ensure-chromium] found ${CHROMIUM}`);
  process.exit(0);
}

console.log(`[ensure-chromium] ${CHROMIUM} is missing; installing Debian's chromium package with apt-get`);
const asRoot = typeof process.getuid === "function" && process.getuid() === 0;
const sudo = asRoot ? "" : "sudo ";
try {
  for (const cmd of [`${sudo}apt-get update`, `${sudo}apt-get install -y chromium`]) {
    console.log(`[ensure-chromium] $ ${cmd}`);
    execSync(cmd, { stdio: "inherit", env: { ...process.env, DEBIAN_FRONTEND: "noninteractive" } });
  }
} catch (error) {
  console.error(`[ensure-chromium] installing chromium failed: ${error instanceof Error ? error.message : String(error)}`);
  process.exit(1);
}

if (!existsSync(CHROMIUM)) {
  console.error(`[ensure-chromium] apt-get finished but ${CHROMIUM} is still missing`);
  process.exit(1);
}
console.log(`[ensure-chromium] installed ${CHROMIUM}`);
