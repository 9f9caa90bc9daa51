/** The generated auth secret: made once, kept, and the data folder made for it when missing (server mode has none). */
import { mkdtempSync, rmSync, statSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterEach, describe, expect, it } from "vitest";
import { loadSecret } from "@backend/lib/secret";

const made: string[] = [];
afterEach(() => {
  for (const d of made.splice(0)) rmSync(d, { recursive: true, force: true });
});

describe("loadSecret", () => {
  it("makes a missing data folder, writes the secret once and reads the same one back", () => {
    const root = mkdtempSync(join(tmpdir(), "orthostack-secret-"));
    made.push(root);
    const dir = join(root, "not", "there");
    const first = loadSecret(dir);
    expect(first.length).toBeGreaterThanOrEqual(32);
    expect(statSync(join(dir, ".auth-secret")).mode & 0o777).toBe(0o600);
    expect(loadSecret(dir)).toBe(first);
    expect(loadSecret(dir, "from-the-environment")).toBe("from-the-environment");
  });
});
