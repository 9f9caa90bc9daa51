import { and, asc, desc, eq, sql } from "drizzle-orm";
import { alias, type SelectedFields } from "drizzle-orm/pg-core";
import type * as z from "zod";
import { diffRevisions } from "@shared/revisions/diff";
import type {
  Requirement,
  Revision,
  RevisionCheck,
  RevisionDiff,
  RevisionSummary,
  CreateRevisionSchema,
  UpdateRevisionSchema,
} from "@shared/schemas/revisions";
import type { Database } from "../db/client";
import { comments, projects, stackRevisions, users } from "../db/schema";
import { badRequest, conflict, found } from "../lib/errors";
import { requireVersion, writeVersioned } from "../lib/versions";
import type { Actor } from "../middleware/session";
import { recordActivity } from "./activity";
import { yieldToEventLoop } from "../lib/yield";
import { assertProjectOpen } from "./project-records";
import { checkRequirements, checkStack } from "./stack-check";
import { geometryWarnings } from "@shared/stack-geometry";
import { validateStackFile, type StackFile } from "@shared/schemas/stack-file";
import { formatWritten, formatYield } from "@shared/format";

const creator = alias(users, "creator");
const approver = alias(users, "approver");

/** A revision's own columns and who made and approved it: everything of the answer but its content. */
const baseColumns = {
  id: stackRevisions.id,
  projectId: stackRevisions.projectId,
  number: stackRevisions.number,
  status: stackRevisions.status,
  version: stackRevisions.version,
  note: stackRevisions.note,
  basedOnId: stackRevisions.basedOnId,
  createdByName: creator.name,
  approvedByName: approver.name,
  createdAt: stackRevisions.createdAt,
  updatedAt: stackRevisions.updatedAt,
  submittedAt: stackRevisions.submittedAt,
  approvedAt: stackRevisions.approvedAt,
};

type BaseRow = { createdAt: Date; updatedAt: Date; submittedAt: Date | null; approvedAt: Date | null } & Omit<
  RevisionSummary,
  "name" | "createdAt" | "updatedAt" | "submittedAt" | "approvedAt"
>;

const iso = (d: Date | null) => (d ? d.toISOString() : null);
function toSummary(r: BaseRow, name: string): RevisionSummary {
  return {
    ...r,
    name,
    createdAt: r.createdAt.toISOString(),
    updatedAt: r.updatedAt.toISOString(),
    submittedAt: iso(r.submittedAt),
    approvedAt: iso(r.approvedAt),
  };
}

/** One revision's base columns and `extra`, in the workspace. */
function selectRevision<E extends SelectedFields>(db: Database, workspaceId: string, id: string, extra: E) {
  return db
    .select({ ...baseColumns, ...extra })
    .from(stackRevisions)
    .leftJoin(creator, eq(creator.id, stackRevisions.createdBy))
    .leftJoin(approver, eq(approver.id, stackRevisions.approvedBy))
    .where(and(eq(stackRevisions.workspaceId, workspaceId), eq(stackRevisions.id, id)));
}

async function assertProject(db: Database, workspaceId: string, projectId: string) {
  const [p] = await db
    .select({ id: projects.id, name: projects.name })
    .from(projects)
    .where(and(eq(projects.workspaceId, workspaceId), eq(projects.id, projectId)));
  return found(p, "The project");
}

export async function listRevisions(db: Database, workspaceId: string, projectId: string): Promise<RevisionSummary[]> {
  await assertProject(db, workspaceId, projectId);
  const rows = await db
    // the name from its own column: the list never reads the stacks themselves
    .select({ ...baseColumns, stackName: stackRevisions.stackName })
    .from(stackRevisions)
    .leftJoin(creator, eq(creator.id, stackRevisions.createdBy))
    .leftJoin(approver, eq(approver.id, stackRevisions.approvedBy))
    .where(and(eq(stackRevisions.workspaceId, workspaceId), eq(stackRevisions.projectId, projectId)))
    .orderBy(desc(stackRevisions.number));
  return rows.map(({ stackName, ...r }) => toSummary(r, stackName));
}

export async function getRevisionRow(db: Database, workspaceId: string, id: string) {
  const [row] = await db
    .select()
    .from(stackRevisions)
    .where(and(eq(stackRevisions.workspaceId, workspaceId), eq(stackRevisions.id, id)));
  return found(row, "The stack revision");
}

/** What a change checks before it writes (state, version, project), without the content. */
async function revisionState(db: Database, workspaceId: string, id: string) {
  const [row] = await db
    .select({
      id: stackRevisions.id,
      projectId: stackRevisions.projectId,
      number: stackRevisions.number,
      status: stackRevisions.status,
      version: stackRevisions.version,
      note: stackRevisions.note,
      requirements: stackRevisions.requirements,
    })
    .from(stackRevisions)
    .where(and(eq(stackRevisions.workspaceId, workspaceId), eq(stackRevisions.id, id)));
  return found(row, "The stack revision");
}

async function storedStack(db: Database, id: string) {
  const [row] = await db.select({ stack: stackRevisions.stack }).from(stackRevisions).where(eq(stackRevisions.id, id));
  return found(row, "The stack revision").stack;
}

export async function listComments(db: Database, targetType: "revision" | "report", targetId: string) {
  const rows = await db
    .select({ id: comments.id, authorName: users.name, kind: comments.kind, body: comments.body, createdAt: comments.createdAt })
    .from(comments)
    .leftJoin(users, eq(users.id, comments.authorId))
    .where(and(eq(comments.targetType, targetType), eq(comments.targetId, targetId)))
    .orderBy(asc(comments.createdAt));
  return rows.map((c) => ({ ...c, createdAt: c.createdAt.toISOString() }));
}

export async function getRevision(db: Database, workspaceId: string, id: string): Promise<Revision> {
  const [row] = await selectRevision(db, workspaceId, id, { stack: stackRevisions.stack, requirements: stackRevisions.requirements });
  const { stack, requirements, ...base } = found(row, "The stack revision");
  return revisionAnswer(db, base, stack, requirements, warningsOf(stack));
}

/** The answer for a revision whose content is in hand (read, or just written). */
async function revisionAnswer(
  db: Database,
  base: BaseRow,
  stack: StackFile,
  requirements: Requirement[],
  warnings: Revision["warnings"],
): Promise<Revision> {
  return {
    ...toSummary(base, stack.name ?? ""),
    stack,
    requirements,
    comments: await listComments(db, "revision", base.id),
    warnings,
  };
}

/** Stored stacks were validated when saved; one that no longer validates has no warnings to give. */
function warningsOf(stack: unknown) {
  const v = validateStackFile(stack);
  return v.ok ? geometryWarnings(v.stack) : [];
}

export async function createRevision(
  db: Database,
  actor: Actor,
  projectId: string,
  input: z.infer<typeof CreateRevisionSchema>,
  basedOnId?: string,
) {
  await assertProject(db, actor.workspaceId, projectId);
  await assertProjectOpen(db, actor.workspaceId, projectId);
  const stack = checkStack(input.stack);
  const requirements: Requirement[] = input.requirements ?? [];
  checkRequirements(stack, requirements);
  const id = await db.transaction(async (tx) => {
    const [{ next }] = await tx
      .select({ next: sql<number>`coalesce(max(${stackRevisions.number}), 0)::int + 1` })
      .from(stackRevisions)
      .where(eq(stackRevisions.projectId, projectId));
    const [row] = await tx
      .insert(stackRevisions)
      .values({
        workspaceId: actor.workspaceId,
        projectId,
        number: next,
        stack,
        requirements,
        note: input.note ?? "",
        basedOnId: basedOnId ?? null,
        createdBy: actor.userId,
      })
      .returning({ id: stackRevisions.id });
    await recordActivity(tx, {
      workspaceId: actor.workspaceId,
      projectId,
      actorId: actor.userId,
      action: "revision.created",
      summary: `started stack revision ${next}`,
      data: { revisionId: row.id },
    });
    return row.id;
  });
  return getRevision(db, actor.workspaceId, id);
}

/** Changes a draft made on version `sent` (none: 428; a stale one: 409 `conflict`, nothing lost). */
export async function updateRevision(
  db: Database,
  actor: Actor,
  id: string,
  input: z.infer<typeof UpdateRevisionSchema>,
  sent: number | undefined,
) {
  const row = await revisionState(db, actor.workspaceId, id);
  const expected = requireVersion(`Stack revision ${row.number}`, row.version, sent);
  await assertProjectOpen(db, actor.workspaceId, row.projectId);
  if (row.status !== "draft") {
    throw conflict(
      row.status === "approved"
        ? "This revision is approved and frozen. Start a new draft from it to make changes."
        : "This revision is in review. Wait for the reviewer, or ask them to send it back.",
      "revision_frozen",
    );
  }
  // the stored stack is read only when the change keeps it: a stack sent whole replaces it unread
  const sentStack = input.stack !== undefined ? checkStack(input.stack) : undefined;
  // a stack sent whole can be large: give other requests a turn between its heavy stages
  const pause = sentStack ? yieldToEventLoop : async () => {};
  await pause();
  const stack = sentStack ?? (await storedStack(db, id));
  const requirements = input.requirements ?? row.requirements;
  checkRequirements(stack, requirements);
  // serialised apart from the write, so that the two are separate stages (each about 25-80 ms
  // for a stack of about 1 MB; the write is PGlite's, on this thread)
  const stackJson = sentStack ? sql`${JSON.stringify(sentStack)}::json` : undefined;
  await pause();
  await db.transaction((tx) =>
    writeVersioned(
      tx,
      stackRevisions,
      id,
      expected,
      `Stack revision ${row.number}`,
      {
        ...(stackJson ? { stack: stackJson } : {}),
        ...(input.requirements ? { requirements } : {}),
        ...(input.note !== undefined ? { note: input.note } : {}),
      },
      {
        where: eq(stackRevisions.status, "draft"),
        otherwise: () => conflict("This revision left its draft state meanwhile; reload it.", "revision_frozen"),
      },
    ),
  );
  await pause();
  // answered from what was just written, not read back: a stack of about 1 MB costs to read
  const [after] = await selectRevision(db, actor.workspaceId, id, {});
  const answer = await revisionAnswer(
    db,
    found(after, "The stack revision"),
    stack,
    requirements,
    sentStack ? geometryWarnings(sentStack) : warningsOf(stack),
  );
  await pause(); // the answer's serialisation is one more such stage
  return answer;
}

type Transition = { from: Revision["status"]; to: Revision["status"]; action: string; verb: string };
const TRANSITIONS = {
  submit: { from: "draft", to: "in_review", action: "revision.submitted", verb: "submitted for review" },
  approve: { from: "in_review", to: "approved", action: "revision.approved", verb: "approved" },
  return: { from: "in_review", to: "draft", action: "revision.returned", verb: "sent back" },
} satisfies Record<string, Transition>;

const STATUS_WORDS: Record<Revision["status"], string> = { draft: "a draft", in_review: "in review", approved: "approved" };

export type TransitionOptions = {
  /** the reviewer's comment (approve, return) */
  comment?: string;
  /** submit: the note that replaces the draft's */
  note?: string;
  /** submit: how the revision meets its requirements (services/requirement-check.ts) */
  check?: () => Promise<RevisionCheck>;
  /** submit: the engineer has seen which requirements fail and submits anyway */
  confirmFailing?: boolean;
};

/** "2 requirements are not met: Heading error ≤ 1.5 deg: 97.0 % of units, 99.73 % asked (live estimate); …" */
export function failingWords(failing: RevisionCheck["failing"]) {
  const each = failing.map(
    (f) =>
      `${f.label} ≤ ${formatWritten(f.max, f.unit)}: ${formatYield(f.reached)} of units, ${formatYield(f.target)} asked (${
        f.source.kind === "study" ? `study ${f.source.number}` : "live estimate"
      })`,
  );
  return `${failing.length === 1 ? "1 requirement is" : `${failing.length} requirements are`} not met: ${each.join("; ")}`;
}

export async function transitionRevision(
  db: Database,
  actor: Actor,
  id: string,
  kind: keyof typeof TRANSITIONS,
  sent: number | undefined,
  { comment, note, check, confirmFailing }: TransitionOptions = {},
) {
  const t = TRANSITIONS[kind];
  const row = await revisionState(db, actor.workspaceId, id);
  const expected = requireVersion(`Stack revision ${row.number}`, row.version, sent);
  await assertProjectOpen(db, actor.workspaceId, row.projectId);
  if (row.status !== t.from) {
    throw conflict(
      `Revision ${row.number} is ${STATUS_WORDS[row.status]}; only a revision that is ${STATUS_WORDS[t.from]} can be ${t.verb}.`,
      "invalid_state",
    );
  }
  const finalNote = note ?? row.note;
  // the reviewer of a later revision needs the engineer's own words on what changed and why
  if (kind === "submit" && row.number > 1 && !finalNote.trim()) {
    throw badRequest("Say what changed and why before submitting.", [
      { path: "note", message: "a revision after the first needs a note: what changed and why" },
    ]);
  }
  // the engineer decides knowing what fails; the reviewer reads it in the activity
  const failing = kind === "submit" && check ? (await check()).failing : [];
  if (failing.length && !confirmFailing) {
    throw conflict(`${failingWords(failing)}. Confirm that you submit it anyway.`, "requirements_not_met");
  }
  const now = new Date();
  await db.transaction(async (tx) => {
    await writeVersioned(
      tx,
      stackRevisions,
      id,
      expected,
      `Stack revision ${row.number}`,
      {
        status: t.to,
        ...(kind === "submit" ? { submittedAt: now, submittedBy: actor.userId, note: finalNote } : {}),
        ...(kind === "approve" ? { approvedAt: now, approvedBy: actor.userId } : {}),
      },
      {
        where: eq(stackRevisions.status, t.from),
        otherwise: () => conflict("The revision changed meanwhile; reload and try again.", "invalid_state"),
      },
    );
    if (comment || kind !== "submit") {
      await tx.insert(comments).values({
        workspaceId: actor.workspaceId,
        projectId: row.projectId,
        targetType: "revision",
        targetId: id,
        authorId: actor.userId,
        kind: kind === "return" ? "returned" : kind === "approve" ? "approved" : "comment",
        body: comment ?? (kind === "approve" ? "Approved." : ""),
      });
    }
    await recordActivity(tx, {
      workspaceId: actor.workspaceId,
      projectId: row.projectId,
      actorId: actor.userId,
      action: t.action,
      summary: `${t.verb} stack revision ${row.number}${comment ? `: “${comment.slice(0, 140)}”` : ""}${
        failing.length ? `, knowing that ${failingWords(failing).slice(0, 400)}` : ""
      }`,
      data: {
        revisionId: id,
        ...(failing.length
          ? { failing: failing.map((f) => ({ metric: f.metric, max: f.max, target: f.target, reached: f.reached, source: f.source })) }
          : {}),
      },
    });
  });
  return getRevision(db, actor.workspaceId, id);
}

export async function addRevisionComment(db: Database, actor: Actor, id: string, body: string) {
  const row = await revisionState(db, actor.workspaceId, id);
  await assertProjectOpen(db, actor.workspaceId, row.projectId);
  await db.transaction(async (tx) => {
    await tx.insert(comments).values({
      workspaceId: actor.workspaceId,
      projectId: row.projectId,
      targetType: "revision",
      targetId: id,
      authorId: actor.userId,
      body,
    });
    await recordActivity(tx, {
      workspaceId: actor.workspaceId,
      projectId: row.projectId,
      actorId: actor.userId,
      action: "revision.commented",
      summary: `commented on stack revision ${row.number}`,
      data: { revisionId: id },
    });
  });
  return listComments(db, "revision", id);
}

/**
 * A new draft whose content is a copy of an existing revision (how an approved one is edited).
 * Its note starts empty: the engineer says what changed and why before submitting (a note
 * written for them would pass that check unread); what it is based on is `basedOnId`.
 */
export async function draftFrom(db: Database, actor: Actor, id: string) {
  const row = await getRevisionRow(db, actor.workspaceId, id);
  return createRevision(db, actor, row.projectId, { stack: row.stack, requirements: row.requirements, note: "" }, row.id);
}

/** The revision before this one: the one it is based on, else the previous number in its project. */
async function previousOf(db: Database, row: typeof stackRevisions.$inferSelect) {
  if (row.basedOnId) {
    const [b] = await db
      .select()
      .from(stackRevisions)
      .where(and(eq(stackRevisions.workspaceId, row.workspaceId), eq(stackRevisions.id, row.basedOnId)));
    if (b) return b;
  }
  const [p] = await db
    .select()
    .from(stackRevisions)
    .where(and(eq(stackRevisions.projectId, row.projectId), sql`${stackRevisions.number} < ${row.number}`))
    .orderBy(desc(stackRevisions.number))
    .limit(1);
  return p ?? null;
}

/** What changed from `againstId` (default: the revision before) to this revision. */
export async function revisionDiff(db: Database, workspaceId: string, id: string, againstId?: string): Promise<RevisionDiff> {
  const row = await getRevisionRow(db, workspaceId, id);
  let other: typeof stackRevisions.$inferSelect | null;
  if (againstId) {
    const [o] = await db
      .select()
      .from(stackRevisions)
      .where(and(eq(stackRevisions.workspaceId, workspaceId), eq(stackRevisions.id, againstId)));
    if (!o || o.projectId !== row.projectId) {
      throw badRequest("The revision to compare with is not in this project.", [
        { path: "against", message: "no such revision in this project" },
      ]);
    }
    other = o;
  } else {
    other = await previousOf(db, row);
  }
  if (!other) return { against: null, changes: [] };
  return {
    against: { id: other.id, number: other.number },
    changes: diffRevisions({ stack: other.stack, requirements: other.requirements }, { stack: row.stack, requirements: row.requirements }),
  };
}
