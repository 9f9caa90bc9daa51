import { Router } from "express";
import { STACK_TEMPLATES } from "@shared/stack-templates";
import { TYPICAL_TOLERANCES } from "@shared/typical-tolerances";
import { StackTemplatesResponseSchema, TypicalTolerancesResponseSchema } from "@shared/schemas/stack-help";
import { send } from "../lib/respond";
import { allow } from "../middleware/session";

/** Help for entering a stack: typical tolerances and templates (read-only data from `shared/`). */
export function stackHelpRouter() {
  const r = Router();

  r.get("/typical-tolerances", allow("projects.read"), (_req, res) => {
    send(res, TypicalTolerancesResponseSchema, { typical: [...TYPICAL_TOLERANCES] });
  });

  r.get("/stack-templates", allow("projects.read"), (_req, res) => {
    send(res, StackTemplatesResponseSchema, { templates: [...STACK_TEMPLATES] });
  });

  return r;
}
