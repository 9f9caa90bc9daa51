/** Stack revisions with their comments, studies, results, and the server-mode study parts and queue workers. */
import {
  boolean,
  doublePrecision,
  index,
  integer,
  json,
  jsonb,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from "drizzle-orm/pg-core";
import { version, timestamps, bytea } from "./columns";
import { users } from "./auth";
import { workspaces, projects } from "./workspace";
import type { AsBuiltRecord } from "@shared/schemas/datasets";
import type { ResultFile } from "@shared/schemas/result-file";
import { REVISION_STATUSES, type Requirement } from "@shared/schemas/revisions";
import type { FieldAtSite } from "@shared/schemas/site";
import type { StackFile } from "@shared/schemas/stack-file";
import { STUDY_STATUSES } from "@shared/schemas/studies";
import type { StudyFile } from "@shared/schemas/study-file";

// ---- stack revisions and comments ------------------------------------------------

export const stackRevisions = pgTable(
  "stack_revisions",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    workspaceId: uuid("workspace_id")
      .notNull()
      .references(() => workspaces.id, { onDelete: "cascade" }),
    projectId: uuid("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    /** 1, 2, 3… within the project. */
    number: integer("number").notNull(),
    status: text("status", { enum: REVISION_STATUSES }).notNull().default("draft"),
    /**
     * The stack file of MODEL.md §9 (validated before it is stored). `json`, not `jsonb`: it is
     * only ever stored and read whole, never queried inside, and a stack may hold up to 2 × 10^5
     * measured values, which jsonb converts one by one to and from its numeric form on every
     * save and read (about 1 MB took 3 times as long to write as json text; docs/security.md).
     */
    stack: json("stack").$type<StackFile>().notNull(),
    /**
     * The stack's name, so that lists need not read the whole stack: set from `stack` by the
     * trigger of migration 0015 on every insert and every update of the stack, never by the app.
     */
    stackName: text("stack_name").notNull().default(""),
    /** The requirements the stack must meet: [{metric, max, yield}]. */
    requirements: jsonb("requirements").$type<Requirement[]>().notNull().default([]),
    note: text("note").notNull().default(""),
    basedOnId: uuid("based_on_id"),
    createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
    submittedAt: timestamp("submitted_at", { withTimezone: true }),
    submittedBy: text("submitted_by").references(() => users.id, { onDelete: "set null" }),
    approvedAt: timestamp("approved_at", { withTimezone: true }),
    approvedBy: text("approved_by").references(() => users.id, { onDelete: "set null" }),
    version: version(),
    ...timestamps,
  },
  (t) => [uniqueIndex("stack_revisions_project_number_idx").on(t.projectId, t.number)],
);

export const comments = pgTable(
  "comments",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    workspaceId: uuid("workspace_id")
      .notNull()
      .references(() => workspaces.id, { onDelete: "cascade" }),
    projectId: uuid("project_id").references(() => projects.id, { onDelete: "cascade" }),
    /** What the comment is on: a revision or a report. */
    targetType: text("target_type", { enum: ["revision", "report"] }).notNull(),
    targetId: uuid("target_id").notNull(),
    authorId: text("author_id").references(() => users.id, { onDelete: "set null" }),
    /** "comment", or the decision it records: "returned", "approved". */
    kind: text("kind").notNull().default("comment"),
    body: text("body").notNull(),
    createdAt: timestamp("created_at", { withTimezone: true }).defaultNow().notNull(),
  },
  (t) => [index("comments_target_idx").on(t.targetType, t.targetId)],
);

// ---- studies ------------------------------------------------------------------------

export const studies = pgTable(
  "studies",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    workspaceId: uuid("workspace_id")
      .notNull()
      .references(() => workspaces.id, { onDelete: "cascade" }),
    projectId: uuid("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    revisionId: uuid("revision_id")
      .notNull()
      .references(() => stackRevisions.id, { onDelete: "cascade" }),
    /** 1, 2, 3… within the project. */
    number: integer("number").notNull(),
    label: text("label").notNull().default(""),
    status: text("status", { enum: STUDY_STATUSES }).notNull().default("queued"),
    /** Frozen copies: the study file as run, and the stack it ran on (a draft may change later). */
    study: jsonb("study").$type<StudyFile>().notNull(),
    stack: jsonb("stack").$type<StackFile>().notNull(),
    /** The site and the field found for it, when the inclination came from the WMM. */
    site: jsonb("site").$type<FieldAtSite>(),
    trialsDone: integer("trials_done").notNull().default(0),
    trialsTotal: integer("trials_total").notNull().default(0),
    trialsPerSecond: doublePrecision("trials_per_second"),
    error: text("error"),
    /** The tolerance sources replaced by measured data sets (issue 7), null for a design study. */
    asBuilt: jsonb("as_built").$type<AsBuiltRecord[]>(),
    createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
    startedAt: timestamp("started_at", { withTimezone: true }),
    finishedAt: timestamp("finished_at", { withTimezone: true }),
    ...timestamps,
  },
  (t) => [uniqueIndex("studies_project_number_idx").on(t.projectId, t.number), index("studies_status_idx").on(t.status, t.createdAt)],
);

/** The result file and plot data; written in the same transaction that marks the study finished. */
export const studyResults = pgTable("study_results", {
  studyId: uuid("study_id")
    .primaryKey()
    .references(() => studies.id, { onDelete: "cascade" }),
  result: jsonb("result").$type<ResultFile>().notNull(),
  passes: boolean("passes"),
  createdAt: timestamp("created_at", { withTimezone: true }).defaultNow().notNull(),
});

/**
 * Server mode (DATABASE_URL): a study cut into parts, each a range of blocks run by one job of
 * the queue. A finished part holds its block partials and worker state (node:v8 serialised);
 * the job that finishes the last part merges them in block order and writes the result. A part
 * run again after its worker died overwrites its own row, so nothing is counted twice.
 */
export const studyParts = pgTable(
  "study_parts",
  {
    studyId: uuid("study_id")
      .notNull()
      .references(() => studies.id, { onDelete: "cascade" }),
    part: integer("part").notNull(),
    blockFrom: integer("block_from").notNull(),
    blockTo: integer("block_to").notNull(),
    trialsDone: integer("trials_done").notNull().default(0),
    data: bytea("data"),
    finishedAt: timestamp("finished_at", { withTimezone: true }),
    createdAt: timestamp("created_at", { withTimezone: true }).defaultNow().notNull(),
  },
  (t) => [primaryKey({ columns: [t.studyId, t.part] })],
);

/** Worker processes of the job queue, as last seen (the health route and the admin's status page). */
export const queueWorkers = pgTable("queue_workers", {
  id: text("id").primaryKey(),
  host: text("host").notNull(),
  pid: integer("pid").notNull(),
  threads: integer("threads").notNull(),
  jobsDone: integer("jobs_done").notNull().default(0),
  startedAt: timestamp("started_at", { withTimezone: true }).notNull(),
  seenAt: timestamp("seen_at", { withTimezone: true }).notNull(),
});
