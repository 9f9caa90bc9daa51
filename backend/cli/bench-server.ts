/**
 * The API without the client, for `npm run bench`'s load figures: the runtime of `npm start`
 * (database in DATA_DIR, demo seed, warm engine pool) on a free loopback port, which it writes
 * to standard output as one JSON line with its process id. Stops on SIGTERM.
 */
import { createApp } from "../app";
import { parseEnv } from "../lib/env";
import { createLog } from "../lib/log";
import { createRuntime, startRuntime, stopRuntime } from "../runtime";

const env = parseEnv();
// the load generator reads standard output: log lines go to standard error
const log = createLog({
  info: (line) => process.stderr.write(line + "\n"),
  error: (line, err) => process.stderr.write(`${line} ${String(err)}\n`),
});
const runtime = await createRuntime(env, log);
await startRuntime(runtime);
const app = createApp(runtime.deps, {
  trustedOrigins: env.TRUSTED_ORIGINS,
  sessionCache: runtime.sessionCache,
});
const server = app.listen(0, "127.0.0.1", () => {
  const a = server.address();
  process.stdout.write(JSON.stringify({ port: typeof a === "object" && a ? a.port : 0, pid: process.pid }) + "\n");
});
process.on("SIGTERM", () => {
  server.close();
  void stopRuntime(runtime).then(() => process.exit(0));
});
