import { randomBytes } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";

/**
 * The auth secret: from the environment, or made once and kept in the data folder so sessions
 * survive a restart on a machine where nobody configured anything.
 */
export function loadSecret(dataDir: string, fromEnv?: string): string {
  if (fromEnv) return fromEnv;
  const file = join(dataDir, ".auth-secret");
  if (existsSync(file)) return readFileSync(file, "utf8").trim();
  const secret = randomBytes(32).toString("base64url");
  // in server mode nothing else makes the data folder (the data is in PostgreSQL)
  mkdirSync(dataDir, { recursive: true });
  writeFileSync(file, secret, { mode: 0o600 });
  return secret;
}
