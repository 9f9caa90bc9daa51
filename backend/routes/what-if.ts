import { Router } from "express";
import { IdParamsSchema } from "@shared/schemas/common";
import { RevisionSchema } from "@shared/schemas/revisions";
import {
  AllocationSchema,
  CreateAllocationSchema,
  CreatedRunSchema,
  CreateSweepSchema,
  InclinationGridQuerySchema,
  InclinationGridSchema,
  SweepSchema,
} from "@shared/schemas/what-if";
import type { AppDeps } from "../deps";
import { send } from "../lib/respond";
import { parse } from "../lib/validate";
import { actorOf, allow } from "../middleware/session";
import { inclinationGrid } from "../services/geomagnetic";
import { applyAllocation, cancelRun, createAllocation, createSweep, getAllocation, getSweep } from "../services/what-if";

/** Sweeps, allocations and the inclination map (issue 12). */
export function whatIfRouter({ db, whatIfQueue }: AppDeps) {
  const r = Router();

  r.post("/revisions/:id/sweeps", allow("whatif.run"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const input = parse(CreateSweepSchema, req);
    send(res, CreatedRunSchema, await createSweep(db, whatIfQueue, actorOf(req), id, input), 202);
  });

  r.get("/sweeps/:id", allow("projects.read"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    send(res, SweepSchema, await getSweep(db, actorOf(req).workspaceId, id));
  });

  r.post("/sweeps/:id/cancel", allow("whatif.run"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    await cancelRun(db, whatIfQueue, actorOf(req), id, "sweep");
    send(res, SweepSchema, await getSweep(db, actorOf(req).workspaceId, id));
  });

  r.post("/revisions/:id/allocations", allow("whatif.run"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const input = parse(CreateAllocationSchema, req);
    send(res, CreatedRunSchema, await createAllocation(db, whatIfQueue, actorOf(req), id, input), 202);
  });

  r.get("/allocations/:id", allow("projects.read"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    send(res, AllocationSchema, await getAllocation(db, actorOf(req).workspaceId, id));
  });

  r.post("/allocations/:id/cancel", allow("whatif.run"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    await cancelRun(db, whatIfQueue, actorOf(req), id, "allocation");
    send(res, AllocationSchema, await getAllocation(db, actorOf(req).workspaceId, id));
  });

  r.post("/allocations/:id/apply", allow("revisions.write"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    send(res, RevisionSchema, await applyAllocation(db, actorOf(req), id), 201);
  });

  r.get("/inclination-grid", allow("projects.read"), (req, res) => {
    const { date, stepDeg } = parse(InclinationGridQuerySchema, req, "query");
    send(res, InclinationGridSchema, inclinationGrid(date, stepDeg));
  });

  return r;
}
