/** Supplier reports, their files, sends and downloads, and the mail outbox. */
import { index, integer, jsonb, pgTable, primaryKey, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { version, timestamps, bytea } from "./columns";
import { users } from "./auth";
import { workspaces, suppliers, projects } from "./workspace";
import { stackRevisions, studies } from "./studies";
import {
  REPORT_FILE_KINDS,
  REPORT_STATUSES,
  type ReportCapability,
  type ReportContent,
  type ReportFileKind,
} from "@shared/schemas/reports";

// ---- supplier reports and mail (issue 6) --------------------------------------------

/**
 * One revision of a supplier's tolerance report. A project and supplier share one report
 * number; each new build after a release is the next revision of that number.
 */
export const reports = pgTable(
  "reports",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    workspaceId: uuid("workspace_id")
      .notNull()
      .references(() => workspaces.id, { onDelete: "cascade" }),
    projectId: uuid("project_id")
      .notNull()
      .references(() => projects.id, { onDelete: "cascade" }),
    /** Kept when the company is deleted later; its name stays in `content`. */
    supplierId: uuid("supplier_id").references(() => suppliers.id, { onDelete: "set null" }),
    studyId: uuid("study_id").references(() => studies.id, { onDelete: "set null" }),
    revisionId: uuid("revision_id").references(() => stackRevisions.id, { onDelete: "set null" }),
    /** TR-0001… within the workspace; the same for every revision of one report. */
    number: integer("number").notNull(),
    revision: integer("revision").notNull(),
    status: text("status", { enum: REPORT_STATUSES }).notNull().default("draft"),
    /** Capability asked of the supplier: {cpk, overrides: {sourceId: cpk}}. */
    capability: jsonb("capability").$type<ReportCapability>().notNull(),
    /** Everything the report shows, frozen when it is built (shared/schemas/reports ReportContent). */
    content: jsonb("content").$type<ReportContent>().notNull(),
    note: text("note").notNull().default(""),
    /** Optional PNG of the 3D view; without it the PDF draws a schematic side view. */
    snapshotPng: bytea("snapshot_png"),
    createdBy: text("created_by").references(() => users.id, { onDelete: "set null" }),
    releasedAt: timestamp("released_at", { withTimezone: true }),
    releasedBy: text("released_by").references(() => users.id, { onDelete: "set null" }),
    acknowledgedAt: timestamp("acknowledged_at", { withTimezone: true }),
    acknowledgedBy: text("acknowledged_by").references(() => users.id, { onDelete: "set null" }),
    version: version(),
    ...timestamps,
  },
  (t) => [
    uniqueIndex("reports_workspace_number_revision_idx").on(t.workspaceId, t.number, t.revision),
    index("reports_project_idx").on(t.projectId),
    index("reports_supplier_idx").on(t.supplierId, t.status),
  ],
);

/** The files of a released report, generated once at release and served byte for byte. */
export const reportFiles = pgTable(
  "report_files",
  {
    reportId: uuid("report_id")
      .notNull()
      .references(() => reports.id, { onDelete: "cascade" }),
    kind: text("kind", { enum: REPORT_FILE_KINDS }).notNull(),
    fileName: text("file_name").notNull(),
    contentType: text("content_type").notNull(),
    data: bytea("data").notNull(),
    size: integer("size").notNull(),
    sha256: text("sha256").notNull(),
    createdAt: timestamp("created_at", { withTimezone: true }).defaultNow().notNull(),
  },
  (t) => [primaryKey({ columns: [t.reportId, t.kind] })],
);

export const reportSends = pgTable(
  "report_sends",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    reportId: uuid("report_id")
      .notNull()
      .references(() => reports.id, { onDelete: "cascade" }),
    sentBy: text("sent_by").references(() => users.id, { onDelete: "set null" }),
    recipients: jsonb("recipients").$type<Array<{ name: string; email: string; cc?: boolean }>>().notNull(),
    message: text("message").notNull().default(""),
    /** the released files attached to the mail */
    attachments: jsonb("attachments").$type<ReportFileKind[]>().notNull().default(["pdf"]),
    createdAt: timestamp("created_at", { withTimezone: true }).defaultNow().notNull(),
  },
  (t) => [index("report_sends_report_idx").on(t.reportId)],
);

export const reportDownloads = pgTable(
  "report_downloads",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    reportId: uuid("report_id")
      .notNull()
      .references(() => reports.id, { onDelete: "cascade" }),
    userId: text("user_id").references(() => users.id, { onDelete: "set null" }),
    role: text("role").notNull(),
    kind: text("kind").notNull(),
    createdAt: timestamp("created_at", { withTimezone: true }).defaultNow().notNull(),
  },
  (t) => [index("report_downloads_report_idx").on(t.reportId)],
);

/** What the local mail catcher received (development, demo, tests), as it arrived. */
export const outboxMessages = pgTable(
  "outbox_messages",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    /** From the X-Orthostack-Workspace header we set, so an admin sees only their own mail. */
    workspaceId: uuid("workspace_id").references(() => workspaces.id, { onDelete: "cascade" }),
    mailFrom: text("mail_from").notNull(),
    recipients: jsonb("recipients").$type<string[]>().notNull(),
    subject: text("subject").notNull(),
    text: text("text").notNull().default(""),
    attachments: jsonb("attachments").$type<Array<{ fileName: string; contentType: string; size: number }>>().notNull().default([]),
    size: integer("size").notNull(),
    raw: bytea("raw").notNull(),
    receivedAt: timestamp("received_at", { withTimezone: true }).defaultNow().notNull(),
  },
  (t) => [index("outbox_messages_workspace_idx").on(t.workspaceId, t.receivedAt)],
);
