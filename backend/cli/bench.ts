/**
 * npm run bench: the reference stack and study of tests/fixtures at 10^5 and 10^6
 * trials on worker threads; prints trials per second (wall clock and per CPU-second, the
 * second being what the code costs when the machine is shared), threads and peak memory
 * (RSS of the whole process, workers included).
 */
import { readFileSync } from "node:fs";
import { cpus, loadavg } from "node:os";
import { fileURLToPath } from "node:url";
import { defaultThreads, runStudyOnThreads } from "../engine/runner";
import { validateStackFile } from "@shared/schemas/stack-file";
import { validateStudy } from "@shared/schemas/study-file";

const fixture = (name: string) => fileURLToPath(new URL(`../../tests/fixtures/${name}`, import.meta.url));

async function main() {
  const stackV = validateStackFile(JSON.parse(readFileSync(fixture("stack-reference.json"), "utf8")));
  if (!stackV.ok) throw new Error("reference stack does not validate");
  const studyV = validateStudy(JSON.parse(readFileSync(fixture("study-reference.json"), "utf8")), stackV.stack);
  if (!studyV.ok) throw new Error("reference study does not validate");
  const threadArg = process.argv.indexOf("--threads");
  const threads = threadArg > 0 ? Number(process.argv[threadArg + 1]) : defaultThreads();
  const nAtt = (360 / (studyV.study.headingStepDeg ?? 10)) * (studyV.study.tilts?.length ?? 5);
  console.log(`reference stack, ${nAtt}-attitude sweep, ${threads} thread(s), Node ${process.version}`);
  const [load1] = loadavg();
  console.log(`load average before: ${load1.toFixed(2)} on ${cpus().length} cores (other processes share the machine: wall-clock figures drop with it)`);
  console.log("trials        wall s   trials/s    CPU s   trials per CPU-s   peak RSS");
  for (const trials of [100_000, 1_000_000]) {
    const t0 = performance.now();
    const c0 = process.cpuUsage();
    const r = await runStudyOnThreads(stackV.stack, studyV.study, { trials, threads });
    const s = (performance.now() - t0) / 1000;
    const c = process.cpuUsage(c0);
    const cpuS = (c.user + c.system) / 1e6;
    const rssMb = process.resourceUsage().maxRSS / 1024;
    console.log(
      `${String(r.trials).padEnd(12)} ${s.toFixed(2).padStart(7)} ${Math.round(r.trials / s).toLocaleString("en-US").padStart(10)} ${cpuS.toFixed(2).padStart(8)} ${Math.round(r.trials / cpuS).toLocaleString("en-US").padStart(18)} ${rssMb.toFixed(0).padStart(7)} MB`,
    );
  }
}

main().catch((e) => {
  console.error(e);
  process.exit(1);
});
