import { Router } from "express";
import {
  ActivityListSchema,
  CreateProjectSchema,
  DeleteProjectQuerySchema,
  IdParamsSchema,
  ProjectListQuerySchema,
  ProjectListSchema,
  ProjectSchema,
  UpdateProjectSchema,
} from "@shared/schemas/api";
import type { AppDeps } from "../deps";
import { send } from "../lib/respond";
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
    send(res, ProjectListSchema, { projects: await listProjects(db, actorOf(req).workspaceId, q, archived) });
  });

  r.post("/projects", allow("projects.write"), async (req, res) => {
    const input = parse(CreateProjectSchema, req);
    sendVersioned(res, ProjectSchema, await createProject(db, actorOf(req), input), 201);
  });

  r.get("/projects/:id", allow("projects.read"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    sendVersioned(res, ProjectSchema, await getProject(db, actorOf(req).workspaceId, id));
  });

  r.patch("/projects/:id", allow("projects.write"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const input = parse(UpdateProjectSchema, req);
    sendVersioned(res, ProjectSchema, await updateProject(db, actorOf(req), id, input, sentVersion(req)));
  });

  r.delete("/projects/:id", allow("projects.write"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const { confirm } = parse(DeleteProjectQuerySchema, req, "query");
    await deleteProjectGuarded(db, actorOf(req), id, confirm, sentVersion(req));
    res.status(204).end();
  });

  r.post("/projects/:id/archive", allow("projects.write"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    await setArchived(db, actorOf(req), id, true, sentVersion(req));
    sendVersioned(res, ProjectSchema, await getProject(db, actorOf(req).workspaceId, id));
  });

  r.post("/projects/:id/restore", allow("projects.write"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    await setArchived(db, actorOf(req), id, false, sentVersion(req));
    sendVersioned(res, ProjectSchema, await getProject(db, actorOf(req).workspaceId, id));
  });

  r.get("/projects/:id/activity", allow("projects.read"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const actor = actorOf(req);
    await getProject(db, actor.workspaceId, id);
    send(res, ActivityListSchema, { activity: await listProjectActivity(db, actor.workspaceId, id) });
  });

  return r;
}
