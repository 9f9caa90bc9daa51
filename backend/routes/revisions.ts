import { Router } from "express";
import {
  ApproveRevisionSchema,
  CommentBodySchema,
  CommentListSchema,
  CreateRevisionSchema,
  ReturnRevisionSchema,
  RevisionDiffQuerySchema,
  RevisionCheckSchema,
  RevisionDiffSchema,
  RevisionListSchema,
  RevisionSchema,
  SubmitRevisionSchema,
  UpdateRevisionSchema,
} from "@shared/schemas/revisions";
import { IdParamsSchema } from "@shared/schemas/common";
import type { AppDeps } from "../deps";
import { send } from "../lib/respond";
import { parse } from "../lib/validate";
import { sendVersioned, sentVersion } from "../lib/versions";
import { actorOf, allow } from "../middleware/session";
import { checkRevision, type EstimateRunner } from "../services/requirement-check";
import { notifyRevision } from "../services/review-notifications";
import {
  addRevisionComment,
  createRevision,
  draftFrom,
  getRevision,
  listRevisions,
  revisionDiff,
  transitionRevision,
  updateRevision,
} from "../services/revisions";

const safeFileName = (s: string) =>
  s
    .replace(/[^\w.-]+/g, "-")
    .replace(/^-+|-+$/g, "")
    .slice(0, 80) || "stack";

export function revisionsRouter(deps: AppDeps) {
  const { db } = deps;
  const r = Router();
  const runEstimate: EstimateRunner = (stack, live) => deps.enginePool.estimate(stack, live);

  r.get("/projects/:id/revisions", allow("projects.read"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    send(res, RevisionListSchema, { revisions: await listRevisions(db, actorOf(req).workspaceId, id) });
  });

  r.post("/projects/:id/revisions", allow("revisions.write"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const input = parse(CreateRevisionSchema, req);
    sendVersioned(res, RevisionSchema, await createRevision(db, actorOf(req), id, input), 201);
  });

  r.get("/revisions/:id", allow("projects.read"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    sendVersioned(res, RevisionSchema, await getRevision(db, actorOf(req).workspaceId, id));
  });

  r.patch("/revisions/:id", allow("revisions.write"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const input = parse(UpdateRevisionSchema, req);
    sendVersioned(res, RevisionSchema, await updateRevision(db, actorOf(req), id, input, sentVersion(req)));
  });

  r.post("/revisions/:id/drafts", allow("revisions.write"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    sendVersioned(res, RevisionSchema, await draftFrom(db, actorOf(req), id), 201);
  });

  r.post("/revisions/:id/submit", allow("revisions.write"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const { note, confirmFailing } = parse(SubmitRevisionSchema, req);
    const check = () => checkRevision(db, actorOf(req).workspaceId, id, runEstimate);
    const revision = await transitionRevision(db, actorOf(req), id, "submit", sentVersion(req), { note, check, confirmFailing });
    await notifyRevision(deps, actorOf(req), id, "submit");
    sendVersioned(res, RevisionSchema, revision);
  });

  r.post("/revisions/:id/approve", allow("revisions.review"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const { comment } = parse(ApproveRevisionSchema, req);
    const revision = await transitionRevision(db, actorOf(req), id, "approve", sentVersion(req), { comment: comment || undefined });
    await notifyRevision(deps, actorOf(req), id, "approve", comment || undefined);
    sendVersioned(res, RevisionSchema, revision);
  });

  r.post("/revisions/:id/return", allow("revisions.review"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const { comment } = parse(ReturnRevisionSchema, req);
    const revision = await transitionRevision(db, actorOf(req), id, "return", sentVersion(req), { comment });
    await notifyRevision(deps, actorOf(req), id, "return", comment);
    sendVersioned(res, RevisionSchema, revision);
  });

  r.post("/revisions/:id/comments", allow("revisions.comment"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const { body } = parse(CommentBodySchema, req);
    send(res, CommentListSchema, { comments: await addRevisionComment(db, actorOf(req), id, body) }, 201);
  });

  r.get("/revisions/:id/diff", allow("projects.read"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const { against } = parse(RevisionDiffQuerySchema, req, "query");
    send(res, RevisionDiffSchema, await revisionDiff(db, actorOf(req).workspaceId, id, against));
  });

  r.get("/revisions/:id/requirement-check", allow("projects.read"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    send(res, RevisionCheckSchema, await checkRevision(db, actorOf(req).workspaceId, id, runEstimate));
  });

  r.get("/revisions/:id/stack-file", allow("projects.read"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const rev = await getRevision(db, actorOf(req).workspaceId, id);
    res.setHeader("content-disposition", `attachment; filename="${safeFileName(rev.name)}-rev${rev.number}.stack.json"`);
    res.type("application/json").send(JSON.stringify(rev.stack, null, 2) + "\n");
  });

  return r;
}
