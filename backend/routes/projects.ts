import { Router } from "express";
import {
  CreateProjectSchema,
  DeleteProjectQuerySchema,
  IdParamsSchema,
  ProjectListQuerySchema,
  UpdateProjectSchema,
} from "@shared/schemas/api";
import type { AppDeps } from "../deps";
import { parse } from "../lib/validate";
import { sendVersioned, sentVersion } from "../lib/versions";
import { actorOf, allow } from "../middleware/session";
import { listProjectActivity } from "../services/activity";
import { deleteProjectGuarded, setArchived } from "../services/project-records";
import { createProject, getProject, listProjects, updateProject } from "../services/projects";

export function projectsRouter({ db }: AppDeps) {
  const r = Router();

  r.get("/projects", allow("projects.read"), async (req, res) => {
    const { q, archived } = parse(ProjectListQuerySchema, req, "query");
    res.json({ projects: await listProjects(db, actorOf(req).workspaceId, q, archived) });
  });

  r.post("/projects", allow("projects.write"), async (req, res) => {
    const input = parse(CreateProjectSchema, req);
    sendVersioned(res, await createProject(db, actorOf(req), input), 201);
  });

  r.get("/projects/:id", allow("projects.read"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    sendVersioned(res, await getProject(db, actorOf(req).workspaceId, id));
  });

  r.patch("/projects/:id", allow("projects.write"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const input = parse(UpdateProjectSchema, req);
    sendVersioned(res, await updateProject(db, actorOf(req), id, input, sentVersion(req)));
  });

  r.delete("/projects/:id", allow("projects.write"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const { confirm } = parse(DeleteProjectQuerySchema, req, "query");
    await deleteProjectGuarded(db, actorOf(req), id, confirm);
    res.status(204).end();
  });

  r.post("/projects/:id/archive", allow("projects.write"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    await setArchived(db, actorOf(req), id, true, sentVersion(req));
    sendVersioned(res, await getProject(db, actorOf(req).workspaceId, id));
  });

  r.post("/projects/:id/restore", allow("projects.write"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    await setArchived(db, actorOf(req), id, false, sentVersion(req));
    sendVersioned(res, await getProject(db, actorOf(req).workspaceId, id));
  });

  r.get("/projects/:id/activity", allow("projects.read"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const actor = actorOf(req);
    await getProject(db, actor.workspaceId, id);
    res.json({ activity: await listProjectActivity(db, actor.workspaceId, id) });
  });

  return r;
}
