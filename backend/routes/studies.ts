import { Router } from "express";
import { IdParamsSchema } from "@shared/schemas/common";
import { FieldAtSiteSchema, SiteSchema } from "@shared/schemas/site";
import {
  CreateStudySchema,
  StudyBudgetSchema,
  StudyExportQuerySchema,
  StudyListSchema,
  StudySchema,
  UpdateStudyBudgetSchema,
} from "@shared/schemas/studies";
import type { AppDeps } from "../deps";
import { send } from "../lib/respond";
import { parse } from "../lib/validate";
import { actorOf, allow } from "../middleware/session";
import { fieldAtSite } from "../services/geomagnetic";
import { cancelStudy, createStudy, getStudy, listStudies, rerunStudy } from "../services/studies";
import { studyCsv, studyXlsx } from "../services/study-export";
import { getStudyBudget, setStudyBudget } from "../services/study-budget";

export function studiesRouter({ db, studyQueue }: AppDeps) {
  const r = Router();

  r.get("/projects/:id/studies", allow("projects.read"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    send(res, StudyListSchema, { studies: await listStudies(db, actorOf(req).workspaceId, id) });
  });

  r.post("/revisions/:id/studies", allow("studies.run"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const input = parse(CreateStudySchema, req);
    send(res, StudySchema, await createStudy(db, studyQueue, actorOf(req), id, input), 202);
  });

  r.get("/studies/:id", allow("projects.read"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    send(res, StudySchema, await getStudy(db, actorOf(req).workspaceId, id));
  });

  r.get("/studies/:id/export", allow("projects.read"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const { format } = parse(StudyExportQuerySchema, req, "query");
    const study = await getStudy(db, actorOf(req).workspaceId, id);
    const body = format === "xlsx" ? await studyXlsx(study) : studyCsv(study);
    res.setHeader("content-disposition", `attachment; filename="study-${study.number}-results.${format}"`);
    res.type(format === "xlsx" ? "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet" : "text/csv; charset=utf-8");
    res.send(body);
  });

  r.post("/studies/:id/cancel", allow("studies.run"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    send(res, StudySchema, await cancelStudy(db, studyQueue, actorOf(req), id));
  });

  r.post("/studies/:id/rerun", allow("studies.run"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    send(res, StudySchema, await rerunStudy(db, studyQueue, actorOf(req), id), 202);
  });

  r.get("/workspace/study-budget", allow("studies.run"), async (req, res) => {
    send(res, StudyBudgetSchema, await getStudyBudget(db, actorOf(req).workspaceId));
  });

  r.patch("/workspace/study-budget", allow("workspace.settings"), async (req, res) => {
    const { budget } = parse(UpdateStudyBudgetSchema, req);
    send(res, StudyBudgetSchema, await setStudyBudget(db, actorOf(req), budget));
  });

  r.get("/geomagnetic-field", allow("projects.read"), (req, res) => {
    const site = parse(SiteSchema, req, "query");
    send(res, FieldAtSiteSchema, fieldAtSite(site));
  });

  return r;
}
