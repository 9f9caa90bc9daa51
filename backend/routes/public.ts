import { Router } from "express";
import { AcceptInvitationSchema, InvitationTokenParamsSchema } from "@shared/schemas/api";
import type { AppDeps } from "../deps";
import { parse } from "../lib/validate";
import { acceptInvitation, previewInvitation } from "../services/members";

/** Routes that need no session: health and the invitation hand-shake. */
export function publicRouter({ db, auth, clock, queueStatus }: AppDeps) {
  const r = Router();

  // Server mode adds the job queue: its depth and the worker processes seen in the last minute.
  r.get("/health", async (_req, res) => {
    res.json(queueStatus ? { status: "ok", queue: await queueStatus() } : { status: "ok" });
  });

  r.get("/invitations/by-token/:token", async (req, res) => {
    const { token } = parse(InvitationTokenParamsSchema, req, "params");
    res.json(await previewInvitation(db, token, clock));
  });

  r.post("/invitations/by-token/:token/accept", async (req, res) => {
    const { token } = parse(InvitationTokenParamsSchema, req, "params");
    const input = parse(AcceptInvitationSchema, req);
    const headers = await acceptInvitation(db, auth, clock, token, input);
    const cookies = headers.getSetCookie();
    if (cookies.length) res.setHeader("set-cookie", cookies);
    res.json({ ok: true });
  });

  return r;
}
