/**
 * The database schema: one file, plural tables, camelCase keys over snake_case columns.
 * The first four tables are better-auth's (user, session, account, verification) in the shape
 * its CLI generates for the drizzle adapter; the rest are Orthostack's own.
 */
import { relations, sql } from "drizzle-orm";
import { NOTIFICATION_KINDS } from "@shared/schemas/notifications";
import type { StackFile } from "@shared/schemas/stack-file";
import {
  boolean,
  customType,
  doublePrecision,
  index,
  integer,
  jsonb,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from "drizzle-orm/pg-core";

/**
 * Edit counter of a record people share: every change adds one, and a change is accepted only
 * from a client that saw the current value (If-Match / body version; backend/lib/versions.ts).
 */
const version = () => integer("version").notNull().default(1);

const timestamps = {
  createdAt: timestamp("created_at", { withTimezone: true }).defaultNow().notNull(),
  updatedAt: timestamp("updated_at", { withTimezone: true })
    .defaultNow()
    .$onUpdate(() => new Date())
    .notNull(),
};

// ---- better-auth ------------------------------------------------------------
export const users = pgTable("users", {
  id: text("id").primaryKey(),
  name: text("name").notNull(),
  email: text("email").notNull().unique(),
  emailVerified: boolean("email_verified").default(false).notNull(),
  image: text("image"),
  ...timestamps,
});

export const sessions = pgTable(
  "sessions",
  {
    id: text("id").primaryKey(),
    expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
    token: text("token").notNull().unique(),
    ipAddress: text("ip_address"),
    userAgent: text("user_agent"),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    ...timestamps,
  },
  (t) => [index("sessions_user_id_idx").on(t.userId)],
);

export const accounts = pgTable(
  "accounts",
  {
    id: text("id").primaryKey(),
    accountId: text("account_id").notNull(),
    providerId: text("provider_id").notNull(),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    accessToken: text("access_token"),
    refreshToken: text("refresh_token"),
    idToken: text("id_token"),
    accessTokenExpiresAt: timestamp("access_token_expires_at", { withTimezone: true }),
    refreshTokenExpiresAt: timestamp("refresh_token_expires_at", { withTimezone: true }),
    scope: text("scope"),
    password: text("password"),
    ...timestamps,
  },
  (t) => [index("accounts_user_id_idx").on(t.userId)],
);

export const verifications = pgTable(
  "verifications",
  {
    id: text("id").primaryKey(),
    identifier: text("identifier").notNull(),
    value: text("value").notNull(),
    expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
    ...timestamps,
  },
  (t) => [index("verifications_identifier_idx").on(t.identifier)],
);

// ---- workspace, members, suppliers --------------------------------------------
export const workspaces = pgTable("workspaces", {
  id: uuid("id").primaryKey().defaultRandom(),
  name: text("name").notNull(),
  /** Set on the workspace the seed creates; the seed never writes into any other. */
  isDemo: boolean("is_demo").default(false).notNull(),
  ...timestamps,
});

export const suppliers = pgTable(
  "suppliers",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    workspaceId: uuid("workspace_id")
      .notNull()
      .references(() => workspaces.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    kind: text("kind").notNull().default("other"),
    version: version(),
    ...timestamps,
  },
  (t) => [uniqueIndex("suppliers_workspace_name_idx").on(t.workspaceId, sql`lower(${t.name})`)],
);

export const supplierContacts = pgTable(
  "supplier_contacts",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    supplierId: uuid("supplier_id")
      .notNull()
      .references(() => suppliers.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    email: text("email").notNull(),
    ...timestamps,
  },
  (t) => [uniqueIndex("supplier_contacts_supplier_email_idx").on(t.supplierId, t.email)],
);

export const members = pgTable(
  "members",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    workspaceId: uuid("workspace_id")
      .notNull()
      .references(() => workspaces.id, { onDelete: "cascade" }),
    userId: text("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    role: text("role", { enum: ["admin", "engineer", "reviewer", "supplier"] }).notNull(),
    /** Only for the supplier role: the company whose released reports the user may see. */
    supplierId: uuid("supplier_id").references(() => suppliers.id, { onDelete: "set null" }),
    ...timestamps,
  },
  // One workspace per user for now: a person signs in to exactly one company.
  (t) => [uniqueIndex("members_user_idx").on(t.userId), index("members_workspace_idx").on(t.workspaceId)],
);

export const invitations = pgTable(
  "invitations",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    workspaceId: uuid("workspace_id")
      .notNull()
      .references(() => workspaces.id, { onDelete: "cascade" }),
    email: text("email").notNull(),
    role: text("role", { enum: ["admin", "engineer", "reviewer", "supplier"] }).notNull(),
    supplierId: uuid("supplier_id").references(() => suppliers.id, { onDelete: "cascade" }),
    token: text("token").notNull().unique(),
    status: text("status", { enum: ["pending", "accepted", "revoked"] })
      .notNull()
      .default("pending"),
    invitedBy: text("invited_by").references(() => users.id, { onDelete: "set null" }),
    expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
    acceptedAt: timestamp("accepted_at", { withTimezone: true }),
    ...timestamps,
  },
  (t) => [index("invitations_workspace_idx").on(t.workspaceId)],
);

// ---- projects and activity ------------------------------------------------------
export const projects = pgTable(
  "projects",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    workspaceId: uuid("workspace_id")
      .notNull()
      .references(() => workspaces.id, { onDelete: "cascade" }),
    name: text("name").notNull(),
    description: text("description").notNull().default(""),
    ownerId: text("owner_id").references(() => users.id, { onDelete: "set null" }),
    /** Set when an engineer archives the project: read-only and hidden from the default list. */
    archivedAt: timestamp("archived_at", { withTimezone: true }),
    version: version(),
    ...timestamps,
  },
  (t) => [index("projects_workspace_idx").on(t.workspaceId)],
);

export const activities = pgTable(
  "activities",
  {
    id: uuid("id").primaryKey().defaultRandom(),
    workspaceId: uuid("workspace_id")
      .notNull()
      .references(() => workspaces.id, { onDelete: "cascade" }),
    projectId: uuid("project_id").references(() => projects.id, { onDelete: "cascade" }),
    actorId: text("actor_id").references(() => users.id, { onDelete: "set null" }),
    action: text("action").notNull(),
    summary: text("summary").notNull(),
    data: jsonb("data").$type<Record<string, unknown>>().notNull().default({}),
    createdAt: timestamp("created_at", { withTimezone: true }).defaultNow().notNull(),
  },
  (t) => [index("activities_project_idx").on(t.projectId, t.createdAt)],
);

export const membersRelations = relations(members, ({ one }) => ({
  user: one(users, { fields: [members.userId], references: [users.id] }),
  supplier: one(suppliers, { fields: [members.supplierId], references: [suppliers.id] }),
}));
export const suppliersRelations = relations(suppliers, ({ many }) => ({ contacts: many(supplierContacts) }));
export const supplierContactsRelations = relations(supplierContacts, ({ one }) => ({
  supplier: one(suppliers, { fields: [supplierContacts.supplierId], references: [suppliers.id] }),
}));

// ---- stack revisions and comments ------------------------------------------------
export const REVISION_STATUSES = ["draft", "in_review", "approved"] as const;

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
    /** The stack file of MODEL.md §9 (validated before it is stored). */
    stack: jsonb("stack").$type<StackFile>().notNull(),
    /** The requirements the stack must meet: [{metric, max, yield}]. */
    requirements: jsonb("requirements").$type<Array<{ metric: string; max: number; yield: number }>>().notNull().default([]),
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
export const STUDY_STATUSES = ["queued", "running", "finished", "failed", "cancelled", "interrupted"] as const;

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
    study: jsonb("study").$type<Record<string, unknown>>().notNull(),
    stack: jsonb("stack").$type<StackFile>().notNull(),
    /** The site and the field found for it, when the inclination came from the WMM. */
    site: jsonb("site").$type<Record<string, unknown> | null>(),
    trialsDone: integer("trials_done").notNull().default(0),
    trialsTotal: integer("trials_total").notNull().default(0),
    trialsPerSecond: doublePrecision("trials_per_second"),
    error: text("error"),
    /** The tolerance sources replaced by measured data sets (issue 7), null for a design study. */
    asBuilt: jsonb("as_built").$type<Array<Record<string, unknown>> | null>(),
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
  result: jsonb("result").$type<Record<string, unknown>>().notNull(),
  passes: boolean("passes"),
  createdAt: timestamp("created_at", { withTimezone: true }).defaultNow().notNull(),
});

// ---- supplier reports and mail (issue 6) --------------------------------------------
/** Binary file contents (report files, caught mail), kept in the database beside their records. */
const bytea = customType<{ data: Buffer; driverData: Uint8Array }>({
  dataType: () => "bytea",
  toDriver: (v) => v,
  fromDriver: (v) => Buffer.from(v),
});

export const REPORT_STATUSES = ["draft", "released"] as const;

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
    capability: jsonb("capability").$type<{ cpk: number; overrides: Record<string, number> }>().notNull(),
    /** Everything the report shows, frozen when it is built (shared/schemas/reports ReportContent). */
    content: jsonb("content").$type<Record<string, unknown>>().notNull(),
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
    kind: text("kind", { enum: ["pdf", "xlsx", "csv"] }).notNull(),
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
    recipients: jsonb("recipients").$type<Array<{ name: string; email: string }>>().notNull(),
    message: text("message").notNull().default(""),
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
    fileType: text("file_type", { enum: ["csv", "xlsx"] }).notNull(),
    sheet: text("sheet"),
    sizeBytes: integer("size_bytes").notNull(),
    sha256: text("sha256").notNull(),
    rowCount: integer("row_count").notNull(),
    /** [{key, name, letter, unit, kind, summary}] in file order */
    columns: jsonb("columns").$type<Array<Record<string, unknown>>>().notNull(),
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
  (t) => [primaryKey({ columns: [t.datasetId, t.column] })],
);

// ---- what-if runs (issue 12): sweeps and tolerance allocations ------------------------
export const WHAT_IF_KINDS = ["sweep", "allocation"] as const;

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
    input: jsonb("input").$type<Record<string, unknown>>().notNull(),
    /** Frozen copy of the revision's stack. */
    stack: jsonb("stack").$type<StackFile>().notNull(),
    /** Points so far (a sweep stores each finished point) or the allocation's outcome. */
    result: jsonb("result").$type<Record<string, unknown> | null>(),
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
