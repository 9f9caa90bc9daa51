/** Measured data sets and mappings, what-if runs, notifications. */
import { doublePrecision, index, integer, jsonb, pgTable, primaryKey, text, timestamp, uuid } from "drizzle-orm/pg-core";
import { version, timestamps, bytea } from "./columns";
import { users } from "./auth";
import { workspaces, suppliers, projects } from "./workspace";
import { stackRevisions } from "./studies";
import { reports } from "./reports";
import { NOTIFICATION_KINDS } from "@shared/schemas/notifications";
import type { StackFile } from "@shared/schemas/stack-file";
import { DATASET_FILE_TYPES, type StoredColumn } from "@shared/schemas/datasets";
import { STUDY_STATUSES } from "@shared/schemas/studies";
import { WHAT_IF_KINDS, type WhatIfInput, type WhatIfResult } from "@shared/schemas/what-if";

// ---- measured data sets (issue 7) -------------------------------------------------------
/**
 * An uploaded measurement file: the original bytes, its columns (header, unit, summary), the
 * values column by column and the first rows for the preview. Written once; only its
 * mappings change later.
 */
export const datasets = pgTable(
  "datasets",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    workspaceId: uuid("workspace_id")
      .notNull()
      .references(() => workspaces.id, { onDelete: "cascade" }),
    projectId: uuid("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    fileType: text("file_type", { enum: DATASET_FILE_TYPES }).notNull(),
    sheet: text("sheet"),
    sizeBytes: integer("size_bytes").notNull(),
    sha256: text("sha256").notNull(),
    rowCount: integer("row_count").notNull(),
    /** [{key, name, letter, unit, kind, summary}] in file order */
    columns: jsonb("columns").$type<StoredColumn[]>().notNull(),
    /** column key -> its values (numbers, or texts for a label column), in row order; null marks a gap (empty or NA) */
    data: jsonb("data").$type<Record<string, Array<number | string | null>>>().notNull(),
    preview: jsonb("preview").$type<{ rowNumbers: number[]; cells: string[][] }>().notNull(),
    /** row number in the file of each data row (blank rows are skipped), for outlier messages */
    rowNumbers: jsonb("row_numbers").$type<number[]>().notNull(),
    file: bytea("file").notNull(),
    uploadedBy: text("uploaded_by").references(() => users.id, { onDelete: "set null" }),
    uploaderRole: text("uploader_role").notNull(),
    /** Set when a supplier sent the file through a released report. */
    supplierId: uuid("supplier_id").references(() => suppliers.id, { onDelete: "set null" }),
    reportId: uuid("report_id").references(() => reports.id, { onDelete: "set null" }),
    /** The production lot the whole file belongs to, as the sender gave it (null: not given). */
    lot: text("lot"),
    /** The sender's note on the upload. */
    note: text("note"),
    /** A label column marked as each row's lot (or date); rows keep the file's order as production order. */
    lotColumn: text("lot_column"),
    /** Version of the column mappings (the part of a data set people edit). */
    version: version(),
    createdAt: timestamp("created_at", { withTimezone: true }).defaultNow().notNull(),
  },
  (t) => [index("datasets_project_idx").on(t.projectId, t.createdAt), index("datasets_report_idx").on(t.reportId)],
);

/** Which tolerance source of which revision a column measures, in which unit. */
export const datasetMappings = pgTable(
  "dataset_mappings",
  {
    datasetId: uuid("dataset_id")
      .notNull()
      .references(() => datasets.id, { onDelete: "cascade" }),
    column: text("column").notNull(),
    revisionId: uuid("revision_id")
      .notNull()
      .references(() => stackRevisions.id, { onDelete: "cascade" }),
    source: text("source").notNull(),
    /** For a pooled source (bond line, tilt, axis angles): which support point or component this column is. */
    part: integer("part"),
    unit: text("unit").notNull(),
    nominal: doublePrecision("nominal").notNull().default(0),
    updatedBy: text("updated_by").references(() => users.id, { onDelete: "set null" }),
    updatedAt: timestamp("updated_at", { withTimezone: true }).defaultNow().notNull(),
  },
  // the revision side: deleting a revision cascades here, and would otherwise scan every mapping
  (t) => [primaryKey({ columns: [t.datasetId, t.column] }), index("dataset_mappings_revision_idx").on(t.revisionId)],
);

// ---- what-if runs (issue 12): sweeps and tolerance allocations ------------------------

/** A sweep or an allocation: queued like a study, run point by point / round by round, result as JSON. */
export const whatIfRuns = pgTable(
  "what_if_runs",
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
    kind: text("kind", { enum: WHAT_IF_KINDS }).notNull(),
    status: text("status", { enum: STUDY_STATUSES }).notNull().default("queued"),
    /** The validated request (study file, parameter and values, or free sources, costs and bounds). */
    input: jsonb("input").$type<WhatIfInput>().notNull(),
    /** Frozen copy of the revision's stack. */
    stack: jsonb("stack").$type<StackFile>().notNull(),
    /** Points so far (a sweep stores each finished point) or the allocation's outcome. */
    result: jsonb("result").$type<WhatIfResult>(),
    progressDone: integer("progress_done").notNull().default(0),
    progressTotal: integer("progress_total").notNull().default(0),
    error: text("error"),
    /** The draft revision made from an allocation's proposal. */
    appliedRevisionId: uuid("applied_revision_id").references(() => stackRevisions.id, { onDelete: "set null" }),
    createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
    startedAt: timestamp("started_at", { withTimezone: true }),
    finishedAt: timestamp("finished_at", { withTimezone: true }),
    ...timestamps,
  },
  (t) => [index("what_if_runs_status_idx").on(t.status, t.createdAt), index("what_if_runs_revision_idx").on(t.revisionId)],
);

// ---- notifications ---------------------------------------------------------------------
/** Something waiting for one person: shown in the app, and mailed unless they turned that kind off. */
export const notifications = pgTable(
  "notifications",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    workspaceId: uuid("workspace_id")
      .notNull()
      .references(() => workspaces.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    projectId: uuid("project_id").references(() => projects.id, { onDelete: "cascade" }),
    kind: text("kind", { enum: NOTIFICATION_KINDS }).notNull(),
    title: text("title").notNull(),
    /** The app path the notification opens, e.g. /projects/…/revisions/…. */
    link: text("link").notNull(),
    createdAt: timestamp("created_at", { withTimezone: true }).defaultNow().notNull(),
    readAt: timestamp("read_at", { withTimezone: true }),
  },
  (t) => [index("notifications_user_idx").on(t.userId, t.createdAt)],
);

/** The kinds a person does not want by e-mail (in-app notifications stay). */
export const notificationMailOptOuts = pgTable(
  "notification_mail_opt_outs",
  {
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    kind: text("kind", { enum: NOTIFICATION_KINDS }).notNull(),
    createdAt: timestamp("created_at", { withTimezone: true }).defaultNow().notNull(),
  },
  (t) => [primaryKey({ columns: [t.userId, t.kind] })],
);
