import { Router } from "express";
import {
  CreateInvitationSchema,
  IdParamsSchema,
  InvitationListSchema,
  InvitationSchema,
  MemberListSchema,
  MemberSchema,
  ResetLinkSentSchema,
  UpdateMemberSchema,
} from "@shared/schemas/api";
import type { AppDeps } from "../deps";
import { send } from "../lib/respond";
import { parse } from "../lib/validate";
import { actorOf, allow } from "../middleware/session";
import { sendResetLink } from "../services/password-reset";
import { createInvitation, listInvitations, listMembers, removeMember, revokeInvitation, updateMember } from "../services/members";

export function membersRouter(deps: AppDeps) {
  const { db } = deps;
  const r = Router();
  const admin = allow("members.manage");

  r.get("/members", admin, async (req, res) => {
    send(res, MemberListSchema, { members: await listMembers(db, actorOf(req).workspaceId) });
  });

  r.patch("/members/:id", admin, async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const input = parse(UpdateMemberSchema, req);
    send(res, MemberSchema, await updateMember(db, actorOf(req), id, input));
  });

  r.delete("/members/:id", admin, async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    await removeMember(db, deps.auth, actorOf(req), id);
    res.status(204).end();
  });

  r.post("/members/:id/reset-link", admin, async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    send(res, ResetLinkSentSchema, await sendResetLink(db, deps.auth, actorOf(req), id, deps), 201);
  });

  r.get("/invitations", admin, async (req, res) => {
    send(res, InvitationListSchema, { invitations: await listInvitations(db, actorOf(req).workspaceId, deps) });
  });

  r.post("/invitations", admin, async (req, res) => {
    const input = parse(CreateInvitationSchema, req);
    send(res, InvitationSchema, await createInvitation(db, actorOf(req), input, deps), 201);
  });

  r.delete("/invitations/:id", admin, async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    await revokeInvitation(db, actorOf(req).workspaceId, id);
    res.status(204).end();
  });

  return r;
}
