import express, { type Express } from "express";
import { toNodeHandler } from "better-auth/node";
import { CLIENT_IP_HEADER } from "./auth";
import type { AppDeps } from "./deps";
import { errorHandler, notFoundApi } from "./lib/errors";
import { CHECK_RESPONSES } from "./lib/respond";
import { acceptBodies, sameOrigin } from "./middleware/request-guard";
import { refuseUnsafeInput, verifyJsonDepth } from "./middleware/json-guard";
import { securityHeaders } from "./middleware/security-headers";
import { requireSession } from "./middleware/session";
import { SESSION_CACHE_SECONDS, SessionCache } from "./middleware/session-cache";
import { datasetsRouter, UPLOAD_PATHS } from "./routes/datasets";
import { meRouter } from "./routes/me";
import { statusRouter } from "./routes/status";
import { notificationsRouter } from "./routes/notifications";
import { membersRouter } from "./routes/members";
import { projectsRouter } from "./routes/projects";
import { publicRouter } from "./routes/public";
import { reportsRouter } from "./routes/reports";
import { revisionsRouter } from "./routes/revisions";
import { stackHelpRouter } from "./routes/stack-help";
import { studiesRouter } from "./routes/studies";
import { suppliersRouter } from "./routes/suppliers";
import { whatIfRouter } from "./routes/what-if";

export const JSON_LIMIT = "2mb";

export type AppOptions = {
  /** Serves the client after the API (static build or Vite middleware); absent in API tests. */
  mountClient?: (app: Express) => void;
  /** Content-Security-Policy on (production); Vite's dev client needs inline scripts. */
  strictCsp?: boolean;
  /** Origins besides the request's own and APP_URL that may send changes (TRUSTED_ORIGINS). */
  trustedOrigins?: string[];
  /** Express's `trust proxy` (TRUST_PROXY): then the scheme, host and client address come from the proxy's headers. */
  trustProxy?: string;
  /**
   * How long a resolved session cookie is reused in this process (SessionCache); 0 turns the cache
   * off. Default SESSION_CACHE_SECONDS. Not read when sessionCache is given.
   */
  sessionCacheSeconds?: number;
  /** The runtime's cache (server mode: shared with the other app processes through SessionWrites). */
  sessionCache?: SessionCache;
};

/** Builds the Express app from its dependencies; `server.ts` listens, tests do not need to. */
export function createApp(deps: AppDeps, options: AppOptions = {}): Express {
  const app = express();
  app.disable("x-powered-by");
  app.set("query parser", "simple");
  app.locals[CHECK_RESPONSES] = deps.checkResponses;
  if (options.trustProxy) app.set("trust proxy", options.trustProxy);

  app.use(securityHeaders({ appUrl: deps.baseURL, strictCsp: options.strictCsp }));

  // The rate limiter of better-auth keys on this header; only the socket's peer (or, with
  // `trust proxy`, the proxy's forwarded address) may set it.
  app.use((req, _res, next) => {
    req.headers[CLIENT_IP_HEADER] = req.ip ?? req.socket.remoteAddress ?? "unknown";
    next();
  });

  // Changes come only from our own pages, with bodies a foreign form cannot send (issue 10).
  app.use(sameOrigin({ appUrl: deps.baseURL, trustedOrigins: options.trustedOrigins }));
  app.post(
    UPLOAD_PATHS.map((p) => `/api${p}`),
    acceptBodies("multipart/form-data"),
  );
  app.use("/api", acceptBodies("application/json"));

  // Before better-auth's routes: a sign-out or password change must empty the session cache too.
  const seconds = options.sessionCacheSeconds ?? SESSION_CACHE_SECONDS;
  const sessionCache = options.sessionCache ?? (seconds > 0 ? new SessionCache(seconds * 1000) : undefined);
  if (sessionCache) app.use(sessionCache.clearOnWrites());

  app.all("/api/auth/{*splat}", toNodeHandler(deps.auth));

  app.use("/api", express.json({ limit: JSON_LIMIT, verify: verifyJsonDepth }), refuseUnsafeInput);
  app.use("/api", publicRouter(deps));
  app.use("/api", requireSession(deps.auth, deps.db, sessionCache));
  app.use("/api", meRouter());
  app.use("/api", statusRouter(deps));
  app.use("/api", projectsRouter(deps));
  app.use("/api", suppliersRouter(deps));
  app.use("/api", membersRouter(deps));
  app.use("/api", revisionsRouter(deps));
  app.use("/api", stackHelpRouter());
  app.use("/api", studiesRouter(deps));
  app.use("/api", whatIfRouter(deps));
  // Data sets and reports both own paths under /reports/:id/.
  app.use("/api", datasetsRouter(deps));
  app.use("/api", reportsRouter(deps));
  app.use("/api", notificationsRouter(deps));
  app.use("/api", notFoundApi);

  options.mountClient?.(app);

  app.use(errorHandler((err) => deps.log("unhandled error", err)));
  return app;
}
