import { Router } from "express";
import { IdParamsSchema } from "@shared/schemas/common";
import {
  AcknowledgeReportSchema,
  CreateReportSchema,
  OutboxAttachmentParamsSchema,
  ReleaseReportSchema,
  REPORT_FILE_KINDS,
  ReportListQuerySchema,
  ReportListSchema,
  ReportOptionsSchema,
  ReportSchema,
  OutboxSchema,
  SendReportSchema,
  SendResultSchema,
  UpdateReportSchema,
} from "@shared/schemas/reports";
import { CommentBodySchema, CommentListSchema, ReturnRevisionSchema } from "@shared/schemas/revisions";
import type { AppDeps } from "../deps";
import { send } from "../lib/respond";
import { parse } from "../lib/validate";
import { sendVersioned, sentVersion } from "../lib/versions";
import { actorOf, allow } from "../middleware/session";
import { notifyReport } from "../services/review-notifications";
import { reportSentBack } from "../services/review-queue";
import { listOutbox, outboxAttachment } from "../services/outbox";
import {
  acknowledgeReport,
  addReportComment,
  createReport,
  deleteReport,
  releaseReport,
  returnReport,
  updateReport,
} from "../services/report-lifecycle";
import { reportFile } from "../services/report-files";
import { sendReport } from "../services/report-mail";
import { getReport, listReports, reportOptions } from "../services/report-queries";

/** `attachment; filename=…` with an ASCII fallback and the exact UTF-8 name (RFC 6266). */
function disposition(name: string) {
  const ascii = name.replace(/[^\x20-\x7e]/g, "_").replace(/"/g, "");
  return `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(name)}`;
}

export function reportsRouter(deps: AppDeps) {
  const { db, baseURL, mail } = deps;
  const r = Router();

  r.get("/projects/:id/report-options", allow("projects.read"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    send(res, ReportOptionsSchema, await reportOptions(db, actorOf(req), id));
  });

  r.post("/studies/:id/reports", allow("reports.write"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const input = parse(CreateReportSchema, req);
    const report = await createReport(db, actorOf(req), id, input, baseURL);
    await notifyReport(deps, actorOf(req), report.id, "ready");
    sendVersioned(res, ReportSchema, report, 201);
  });

  r.get("/reports", allow("reports.read"), async (req, res) => {
    const query = parse(ReportListQuerySchema, req, "query");
    send(res, ReportListSchema, { reports: await listReports(db, actorOf(req), query) });
  });

  r.get("/reports/:id", allow("reports.read"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    sendVersioned(res, ReportSchema, await getReport(db, actorOf(req), id, baseURL));
  });

  r.patch("/reports/:id", allow("reports.write"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const input = parse(UpdateReportSchema, req);
    // a draft changed after it was sent back is ready for release again: the reviewers are told
    const wasSentBack = await reportSentBack(db, id);
    const report = await updateReport(db, actorOf(req), id, input, baseURL, sentVersion(req));
    if (wasSentBack) await notifyReport(deps, actorOf(req), id, "changed");
    sendVersioned(res, ReportSchema, report);
  });

  r.delete("/reports/:id", allow("reports.write"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    await deleteReport(db, actorOf(req), id, sentVersion(req));
    res.status(204).end();
  });

  r.post("/reports/:id/release", allow("reports.release"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const { comment } = parse(ReleaseReportSchema, req);
    const report = await releaseReport(db, deps.reportRenderer, actorOf(req), id, comment, baseURL, sentVersion(req));
    await notifyReport(deps, actorOf(req), id, "released", comment);
    sendVersioned(res, ReportSchema, report);
  });

  r.post("/reports/:id/return", allow("reports.release"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const { comment } = parse(ReturnRevisionSchema, req);
    const report = await returnReport(db, actorOf(req), id, comment, baseURL, sentVersion(req));
    await notifyReport(deps, actorOf(req), id, "returned", comment);
    sendVersioned(res, ReportSchema, report);
  });

  r.post("/reports/:id/send", allow("reports.send"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const choice = parse(SendReportSchema, req);
    const result = await sendReport(db, mail, actorOf(req), id, choice, baseURL);
    await notifyReport(deps, actorOf(req), id, "sent");
    send(res, SendResultSchema, result);
  });

  r.post("/reports/:id/acknowledge", allow("reports.acknowledge"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const { comment } = parse(AcknowledgeReportSchema, req);
    const report = await acknowledgeReport(db, actorOf(req), id, comment, baseURL, sentVersion(req));
    await notifyReport(deps, actorOf(req), id, "acknowledged", comment);
    sendVersioned(res, ReportSchema, report);
  });

  r.post("/reports/:id/comments", allow("reports.comment"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const { body } = parse(CommentBodySchema, req);
    const comments = await addReportComment(db, actorOf(req), id, body);
    if (actorOf(req).role === "supplier") await notifyReport(deps, actorOf(req), id, "question", body);
    send(res, CommentListSchema, { comments }, 201);
  });

  for (const kind of REPORT_FILE_KINDS) {
    r.get(`/reports/:id/${kind}`, allow("reports.read"), async (req, res) => {
      const { id } = parse(IdParamsSchema, req, "params");
      const file = await reportFile(db, deps.reportRenderer, actorOf(req), id, kind, baseURL);
      res.setHeader("content-type", file.contentType);
      res.setHeader("content-disposition", disposition(file.fileName));
      res.setHeader("cache-control", "private, no-store");
      if (file.sha256) res.setHeader("x-content-sha256", file.sha256);
      res.send(file.data);
    });
  }

  r.get("/outbox", allow("outbox.read"), async (req, res) => {
    send(res, OutboxSchema, await listOutbox(db, mail, actorOf(req).workspaceId));
  });

  r.get("/outbox/:id/attachments/:index", allow("outbox.read"), async (req, res) => {
    const { id, index } = parse(OutboxAttachmentParamsSchema, req, "params");
    const a = await outboxAttachment(db, actorOf(req).workspaceId, id, index);
    res.setHeader("content-type", a.contentType);
    res.setHeader("content-disposition", disposition(a.fileName));
    res.send(a.content);
  });

  return r;
}
