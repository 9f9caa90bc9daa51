import type { Request, RequestHandler } from "express";
import { HttpError } from "../lib/errors";

const SAFE_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

export type OriginPolicy = {
  /** The app's public address (APP_URL, or the default local one). */
  appUrl: string;
  /** Further origins allowed to write, from TRUSTED_ORIGINS (e.g. a second host name behind a proxy). */
  trustedOrigins?: string[];
};

const originOf = (url: string) => {
  try {
    return new URL(url).origin;
  } catch {
    return null;
  }
};

/** The origin this request was addressed to: its Host with the scheme Express sees (or its proxy, with `trust proxy`). */
export const requestOrigin = (req: Request) => `${req.protocol}://${req.get("host") ?? ""}`.toLowerCase();

/**
 * Cross-site request forgery guard for every state-changing request: the browser's `Origin` must
 * be the app's own (the address the request was sent to, APP_URL, or a configured trusted
 * origin). A missing or foreign origin is 403; so is `Sec-Fetch-Site: same-site / cross-site`
 * unless the origin is one explicitly trusted. Cookies are per host, not per port, so a page on
 * another port of the same host would otherwise ride on the user's session.
 */
export function sameOrigin(policy: OriginPolicy): RequestHandler {
  const trusted = new Set((policy.trustedOrigins ?? []).map(originOf).filter((o): o is string => !!o));
  const app = originOf(policy.appUrl);
  return (req, _res, next) => {
    if (SAFE_METHODS.has(req.method)) return next();
    const origin = req.get("origin")?.toLowerCase();
    if (!origin || origin === "null") {
      throw new HttpError(
        403,
        "cross_origin",
        "This request did not say where it came from (no Origin header). Changes are accepted only from the app's own pages.",
      );
    }
    const explicitlyTrusted = trusted.has(origin);
    if (!explicitlyTrusted && origin !== app && origin !== requestOrigin(req)) {
      throw new HttpError(403, "cross_origin", "Changes are accepted only from the app's own pages.");
    }
    const site = req.get("sec-fetch-site");
    if (site && site !== "same-origin" && site !== "none" && !explicitlyTrusted) {
      throw new HttpError(403, "cross_origin", "Changes are accepted only from the app's own pages.");
    }
    next();
  };
}

const hasBody = (req: Request) => {
  if (req.get("transfer-encoding")) return true;
  const length = Number(req.get("content-length") ?? 0);
  return Number.isFinite(length) && length > 0;
};

/**
 * Accepts request bodies only in the listed media types (`application/json` everywhere,
 * `multipart/form-data` on upload routes): a form post or text/plain body, which a foreign page
 * can send without a preflight, is refused with 415 before anything reads it. A route that has
 * already been checked (an upload route, mounted earlier) is not checked again.
 */
export function acceptBodies(...types: string[]): RequestHandler {
  return (req, res, next) => {
    if (SAFE_METHODS.has(req.method) || res.locals.bodyTypeChecked) return next();
    const declared = req.get("content-type");
    if (!declared && !hasBody(req)) return next();
    if (!declared || !req.is(types)) {
      throw new HttpError(415, "unsupported_media_type", `Send the request body as ${types.join(" or ")}.`);
    }
    res.locals.bodyTypeChecked = true;
    next();
  };
}
