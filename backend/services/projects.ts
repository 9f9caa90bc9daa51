import { and, asc, eq, ilike, isNotNull, isNull, or } from "drizzle-orm";
import type { CreateProject, Project, UpdateProject } from "@shared/schemas/api";
import type { Database } from "../db/client";
import { projects, users } from "../db/schema";
import { found } from "../lib/errors";
import { requireVersion, writeVersioned } from "../lib/versions";
import type { Actor } from "../middleware/session";
import { recordActivity } from "./activity";
import { assertProjectOpen } from "./project-records";
import { lastStudies } from "./studies";

const escapeLike = (s: string) => s.replace(/[\\%_]/g, (c) => `\\${c}`);

const projectColumns = {
  id: projects.id,
  name: projects.name,
  description: projects.description,
  ownerId: projects.ownerId,
  ownerName: users.name,
  createdAt: projects.createdAt,
  updatedAt: projects.updatedAt,
  archivedAt: projects.archivedAt,
  version: projects.version,
};

type Row = {
  id: string;
  name: string;
  description: string;
  ownerId: string | null;
  ownerName: string | null;
  createdAt: Date;
  updatedAt: Date;
  archivedAt: Date | null;
  version: number;
};

async function toProjects(db: Database, rows: Row[]): Promise<Project[]> {
  const last = await lastStudies(
    db,
    rows.map((r) => r.id),
  );
  return rows.map((r) => ({
    ...r,
    createdAt: r.createdAt.toISOString(),
    updatedAt: r.updatedAt.toISOString(),
    archivedAt: r.archivedAt ? r.archivedAt.toISOString() : null,
    lastStudy: last.get(r.id) ?? null,
  }));
}

export async function listProjects(db: Database, workspaceId: string, q?: string, archived?: "only" | "all"): Promise<Project[]> {
  const term = q ? `%${escapeLike(q)}%` : undefined;
  const rows = await db
    .select(projectColumns)
    .from(projects)
    .leftJoin(users, eq(users.id, projects.ownerId))
    .where(
      and(
        eq(projects.workspaceId, workspaceId),
        term ? or(ilike(projects.name, term), ilike(projects.description, term)) : undefined,
        archived === "all" ? undefined : archived === "only" ? isNotNull(projects.archivedAt) : isNull(projects.archivedAt),
      ),
    )
    .orderBy(asc(projects.name));
  return toProjects(db, rows);
}

export async function getProject(db: Database, workspaceId: string, id: string): Promise<Project> {
  const rows = await db
    .select(projectColumns)
    .from(projects)
    .leftJoin(users, eq(users.id, projects.ownerId))
    .where(and(eq(projects.workspaceId, workspaceId), eq(projects.id, id)))
    .limit(1);
  const [project] = await toProjects(db, rows);
  return found(project, "The project");
}

export async function createProject(db: Database, actor: Actor, input: CreateProject): Promise<Project> {
  const id = await db.transaction(async (tx) => {
    const [row] = await tx
      .insert(projects)
      .values({ workspaceId: actor.workspaceId, name: input.name, description: input.description, ownerId: actor.userId })
      .returning({ id: projects.id });
    await recordActivity(tx, {
      workspaceId: actor.workspaceId,
      projectId: row.id,
      actorId: actor.userId,
      action: "project.created",
      summary: `created the project “${input.name}”`,
    });
    return row.id;
  });
  return getProject(db, actor.workspaceId, id);
}

export async function updateProject(
  db: Database,
  actor: Actor,
  id: string,
  input: UpdateProject,
  sent: number | undefined,
): Promise<Project> {
  const before = await getProject(db, actor.workspaceId, id);
  const expected = requireVersion(`The project “${before.name}”`, before.version, sent);
  await assertProjectOpen(db, actor.workspaceId, id);
  await db.transaction(async (tx) => {
    await writeVersioned(tx, projects, id, expected, `The project “${before.name}”`, {
      ...(input.name !== undefined ? { name: input.name } : {}),
      ...(input.description !== undefined ? { description: input.description } : {}),
    });
    if (input.name !== undefined && input.name !== before.name) {
      await recordActivity(tx, {
        workspaceId: actor.workspaceId,
        projectId: id,
        actorId: actor.userId,
        action: "project.renamed",
        summary: `renamed the project from “${before.name}” to “${input.name}”`,
      });
    }
  });
  return getProject(db, actor.workspaceId, id);
}
