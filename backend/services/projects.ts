import { and, asc, desc, eq, ilike, isNotNull, isNull, or, sql, type SQL } from "drizzle-orm";
import type { CreateProject, Project, UpdateProject } from "@shared/schemas/api";
import type { Database } from "../db/client";
import { projects, studies, studyResults, users } from "../db/schema";
import { found } from "../lib/errors";
import { requireVersion, writeVersioned } from "../lib/versions";
import type { Actor } from "../middleware/session";
import { recordActivity } from "./activity";
import { assertProjectOpen } from "./project-records";

const escapeLike = (s: string) => s.replace(/[\\%_]/g, (c) => `\\${c}`);

/** Each project's newest study (by number), for the projects table: one row or none per project. */
const newestStudy = (db: Database) =>
  db
    .select({ id: studies.id, status: studies.status, passes: studyResults.passes, finishedAt: studies.finishedAt })
    .from(studies)
    .leftJoin(studyResults, eq(studyResults.studyId, studies.id))
    .where(eq(studies.projectId, projects.id))
    .orderBy(desc(studies.number))
    .limit(1)
    .as("newest_study");

/**
 * The projects with their owner's name and newest study, in one statement (a lateral join on the
 * studies' (project, number) index), so that a list costs one round trip to the database.
 */
function selectProjects(db: Database, where: SQL | undefined) {
  const newest = newestStudy(db);
  return db
    .select({
      id: projects.id,
      name: projects.name,
      description: projects.description,
      ownerId: projects.ownerId,
      ownerName: users.name,
      createdAt: projects.createdAt,
      updatedAt: projects.updatedAt,
      archivedAt: projects.archivedAt,
      version: projects.version,
      lastStudyId: newest.id,
      lastStudyStatus: newest.status,
      lastStudyPasses: newest.passes,
      lastStudyFinishedAt: newest.finishedAt,
    })
    .from(projects)
    .leftJoin(users, eq(users.id, projects.ownerId))
    .leftJoinLateral(newest, sql`true`)
    .where(where)
    .orderBy(asc(projects.name));
}

type Row = Awaited<ReturnType<typeof selectProjects>>[number];

const toProject = ({ lastStudyId, lastStudyStatus, lastStudyPasses, lastStudyFinishedAt, ...r }: Row): Project => ({
  ...r,
  createdAt: r.createdAt.toISOString(),
  updatedAt: r.updatedAt.toISOString(),
  archivedAt: r.archivedAt ? r.archivedAt.toISOString() : null,
  lastStudy:
    lastStudyId && lastStudyStatus
      ? { id: lastStudyId, status: lastStudyStatus, passes: lastStudyPasses, finishedAt: lastStudyFinishedAt?.toISOString() ?? null }
      : null,
});

/**
 * The plain list (no search, archived hidden) is what every page load asks for: a prepared
 * statement per database, so it is planned once, not on every request.
 */
const openListStatements = new WeakMap<Database, ReturnType<typeof prepareOpenList>>();
const prepareOpenList = (db: Database) =>
  selectProjects(db, and(eq(projects.workspaceId, sql.placeholder("workspaceId")), isNull(projects.archivedAt))).prepare(
    "projects_open_list",
  );

export async function listProjects(db: Database, workspaceId: string, q?: string, archived?: "only" | "all"): Promise<Project[]> {
  if (!q && !archived) {
    let statement = openListStatements.get(db);
    if (!statement) openListStatements.set(db, (statement = prepareOpenList(db)));
    return (await statement.execute({ workspaceId })).map(toProject);
  }
  const term = q ? `%${escapeLike(q)}%` : undefined;
  const rows = await selectProjects(
    db,
    and(
      eq(projects.workspaceId, workspaceId),
      term ? or(ilike(projects.name, term), ilike(projects.description, term)) : undefined,
      archived === "all" ? undefined : archived === "only" ? isNotNull(projects.archivedAt) : isNull(projects.archivedAt),
    ),
  );
  return rows.map(toProject);
}

export async function getProject(db: Database, workspaceId: string, id: string): Promise<Project> {
  const [row] = await selectProjects(db, and(eq(projects.workspaceId, workspaceId), eq(projects.id, id))).limit(1);
  return found(row && toProject(row), "The project");
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
