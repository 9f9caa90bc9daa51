import { describe, expect, it } from "vitest";
import { execFile } from "node:child_process";
import { mkdtempSync, readFileSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { ResultFileSchema } from "@shared/schemas/result-file";
import { fixture } from "./helpers";

const root = fileURLToPath(new URL("../..", import.meta.url));

function run(args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  return new Promise((resolve) => {
    // what `npm run study` runs: the launcher, which runs the CLI from its plain-JS bundle
    execFile(process.execPath, ["backend/cli/launch.mjs", "study", ...args], { cwd: root, timeout: 120_000 }, (err, stdout, stderr) => {
      resolve({ code: err ? ((err as { code?: number }).code ?? 1) : 0, stdout, stderr });
    });
  });
}

describe("npm run study", () => {
  const dir = mkdtempSync(join(tmpdir(), "orthostack-cli-"));

  it("writes the result file and prints a summary", async () => {
    const out = join(dir, "result.json");
    const r = await run([
      "tests/fixtures/stack-reference.json",
      "tests/fixtures/study-reference.json",
      "--out",
      out,
      "--trials",
      "5000",
      "--threads",
      "2",
      "--seed",
      "9",
    ]);
    expect(r.stderr).toBe("");
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/heading\.maxAbsDeg .*(PASS|FAIL)/);
    const result = ResultFileSchema.parse(JSON.parse(readFileSync(out, "utf8")));
    expect(result.trials).toBe(5000);
    expect(result.seed).toBe(9);
    expect(result.requirements).toHaveLength(3);
  });

  it("--timings: one line on stderr, the study's moments in the order they happen", async () => {
    const r = await run([
      "tests/fixtures/stack-reference.json",
      "tests/fixtures/study-reference.json",
      "--out",
      join(dir, "timed.json"),
      "--trials",
      "9000",
      "--timings",
    ]);
    expect(r.code).toBe(0);
    const m = r.stderr.match(
      /^timings \(ms since the process started\): study handed to the engine ([\d,]+) · first trial started ([\d,]+) · first block back ([\d,]+) · last block back ([\d,]+) · result ([\d,]+) · written ([\d,]+)\n$/,
    );
    expect(m, r.stderr).not.toBeNull();
    const t = m!.slice(1).map((n) => Number(n.replace(/,/g, "")));
    expect(t[0]).toBeGreaterThan(0);
    for (let i = 1; i < t.length; i++) expect(t[i]).toBeGreaterThanOrEqual(t[i - 1]);
  });

  it("a bad stack file: the validation messages on stderr, exit code 2", async () => {
    const bad = fixture("stack-reference.json") as { elements: { parent: string | null; size: { x: number } }[] };
    bad.elements[3].parent = "nowhere";
    bad.elements[2].size.x = -1;
    const p = join(dir, "bad-stack.json");
    writeFileSync(p, JSON.stringify(bad));
    const r = await run([p, "tests/fixtures/study-reference.json", "--out", join(dir, "x.json")]);
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toContain('elements[3].parent: unknown parent "nowhere"');
    expect(r.stderr).toContain("elements[2].size.x: the length size.x (mm) must be greater than 0");
  });

  it("a bad study file and bad options: exit code 2", async () => {
    const p = join(dir, "bad-study.json");
    writeFileSync(
      p,
      JSON.stringify({
        format: "orthostack.study/1",
        trials: 0,
        seed: 1,
        inclinationDeg: 60,
        requirements: [{ metric: "nope.tiltDeg", max: 1, yield: 0.9 }],
      }),
    );
    const r = await run(["tests/fixtures/stack-reference.json", p, "--out", join(dir, "y.json")]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain("trials: trials must lie between 1 and 10,000,000");
    const o = await run([
      "tests/fixtures/stack-reference.json",
      "tests/fixtures/study-reference.json",
      "--out",
      join(dir, "z.json"),
      "--trials",
      "-5",
    ]);
    expect(o.code).toBe(2);
    expect(o.stderr).toMatch(/--trials must be a whole number/);
    // the upper bound is the study schema's, checked once the schemas are loaded
    const big = await run([
      "tests/fixtures/stack-reference.json",
      "tests/fixtures/study-reference.json",
      "--out",
      join(dir, "w.json"),
      "--trials",
      "10000001",
    ]);
    expect(big.code).toBe(2);
    expect(big.stderr).toContain("--trials must be a whole number from 1 to 10000000, got 10000001");
  });

  it("without --trials, the threads follow the trials the study file declares", async () => {
    // the threads start before the file is validated, from its raw trials field
    const p = join(dir, "small-study.json");
    writeFileSync(p, JSON.stringify({ ...(fixture("study-reference.json") as object), trials: 4096 }));
    const r = await run(["tests/fixtures/stack-reference.json", p, "--out", join(dir, "s.json")]);
    expect(r.code).toBe(0);
    expect(r.stdout).toContain("4,096 trials");
    expect(r.stdout).toContain("· 1 thread ·");
  });
});
