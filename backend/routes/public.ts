import { Router } from "express";
import { rateLimit } from "express-rate-limit";
import {
  AcceptedInvitationSchema,
  AcceptInvitationSchema,
  InvitationPreviewSchema,
  InvitationTokenParamsSchema,
} from "@shared/schemas/api";
import { HealthSchema } from "@shared/schemas/server-status";
import type { AppDeps } from "../deps";
import { HttpError } from "../lib/errors";
import { send } from "../lib/respond";
import { parse } from "../lib/validate";
import { acceptInvitation, previewInvitation } from "../services/members";

/** Routes that need no session: health and the invitation hand-shake. */
export function publicRouter({ db, auth, clock, queueStatus }: AppDeps, acceptPerMinute = 10) {
  const r = Router();

  // Server mode adds the job queue: its depth and the worker processes seen in the last minute.
  r.get("/health", async (_req, res) => {
    send(res, HealthSchema, queueStatus ? { status: "ok", queue: await queueStatus() } : { status: "ok" });
  });

  r.get("/invitations/by-token/:token", async (req, res) => {
    const { token } = parse(InvitationTokenParamsSchema, req, "params");
    send(res, InvitationPreviewSchema, await previewInvitation(db, token, clock));
  });

  // Accepting guesses nothing a token does not already allow, but each try hashes a password:
  // a few per minute per client address is plenty for a person and useless for a flood.
  const acceptLimit = rateLimit({
    windowMs: 60_000,
    limit: acceptPerMinute,
    standardHeaders: "draft-8",
    legacyHeaders: false,
    handler: (_req, _res, next) =>
      next(new HttpError(429, "rate_limited", "Too many tries to accept an invitation. Wait a minute and try again.")),
  });

  r.post("/invitations/by-token/:token/accept", acceptLimit, async (req, res) => {
    const { token } = parse(InvitationTokenParamsSchema, req, "params");
    const input = parse(AcceptInvitationSchema, req);
    const headers = await acceptInvitation(db, auth, clock, token, input);
    const cookies = headers.getSetCookie();
    if (cookies.length) res.setHeader("set-cookie", cookies);
    send(res, AcceptedInvitationSchema, { ok: true });
  });

  return r;
}
