import { Router } from "express";
import { MeSchema } from "@shared/schemas/api";
import { send } from "../lib/respond";
import { actorOf } from "../middleware/session";

export function meRouter() {
  const r = Router();
  r.get("/me", (req, res) => {
    const a = actorOf(req);
    send(res, MeSchema, {
      user: { id: a.userId, name: a.name, email: a.email },
      role: a.role,
      workspace: { id: a.workspaceId, name: a.workspaceName },
      supplierId: a.supplierId,
    });
  });
  return r;
}
