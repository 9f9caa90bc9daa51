import { Router } from "express";
import { MeSchema } from "@shared/schemas/api";
import { actorOf } from "../middleware/session";

export function meRouter() {
  const r = Router();
  r.get("/me", (req, res) => {
    const a = actorOf(req);
    res.json(
      MeSchema.parse({
        user: { id: a.userId, name: a.name, email: a.email },
        role: a.role,
        workspace: { id: a.workspaceId, name: a.workspaceName },
        supplierId: a.supplierId,
      }),
    );
  });
  return r;
}
