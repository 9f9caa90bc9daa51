import type { Express } from "express";
import { createApp } from "./app";
import { buildClientIfNeeded, mountDevClient, mountStaticClient } from "./client";
import { parseEnv } from "./lib/env";
import { consoleSink, createLog } from "./lib/log";
import { createRuntime, startRuntime, stopRuntime } from "./runtime";
import { keepConnectionsLonger } from "./lib/http-server";

const env = parseEnv();
const log = createLog(consoleSink);

const runtime = await createRuntime(env, log);
const { deps } = runtime;
await startRuntime(runtime);

const dev = env.NODE_ENV === "development";
let devApp: Express | undefined;
if (!dev) await buildClientIfNeeded(log);
const app = createApp(deps, {
  strictCsp: !dev,
  trustedOrigins: env.TRUSTED_ORIGINS,
  trustProxy: env.TRUST_PROXY,
  sessionCache: runtime.sessionCache,
  mountClient: dev ? (a) => void (devApp = a) : mountStaticClient,
});
if (devApp) await mountDevClient(devApp);

const server = keepConnectionsLonger(
  app.listen(env.PORT, env.HOST, () => {
    log(
      `serving on ${deps.baseURL} (data ${runtime.handle.kind === "postgres" ? "in the PostgreSQL server of DATABASE_URL" : `in ${env.DATA_DIR}`})`,
    );
  }),
);

let stopping = false;
const stop = async () => {
  if (stopping) return;
  stopping = true;
  server.close();
  await stopRuntime(runtime);
  process.exit(0);
};
process.on("SIGINT", stop);
process.on("SIGTERM", stop);
