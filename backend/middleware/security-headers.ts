import helmet from "helmet";
import type { RequestHandler } from "express";

/** Whether the app's public address (APP_URL) is served over TLS. */
export const servedOverHttps = (appUrl: string) => {
  try {
    return new URL(appUrl).protocol === "https:";
  } catch {
    return false;
  }
};

/**
 * Helmet's headers fitted to the deployment. `Strict-Transport-Security` and the CSP's
 * `upgrade-insecure-requests` make a browser fetch everything over https: right behind TLS,
 * but on a plain-http deployment (any host name but localhost) they stop every asset loading.
 * So both are sent only when APP_URL is https.
 */
export function securityHeaders(options: { appUrl: string; strictCsp?: boolean }): RequestHandler {
  const https = servedOverHttps(options.appUrl);
  return helmet({
    strictTransportSecurity: https ? { maxAge: 31_536_000, includeSubDomains: true } : false,
    contentSecurityPolicy: options.strictCsp
      ? {
          useDefaults: true,
          directives: {
            "default-src": ["'self'"],
            "script-src": ["'self'"],
            "style-src": ["'self'", "'unsafe-inline'"],
            "img-src": ["'self'", "data:", "blob:"],
            "font-src": ["'self'", "data:"],
            "worker-src": ["'self'", "blob:"],
            "connect-src": ["'self'"],
            // helmet's defaults add it; null leaves it out
            "upgrade-insecure-requests": https ? [] : null,
          },
        }
      : false,
  });
}
