/** The workspace, its members, suppliers and their contacts, invitations, projects and activity. */
import { relations, sql } from "drizzle-orm";
import { bigint, boolean, index, jsonb, pgTable, text, timestamp, uniqueIndex, uuid } from "drizzle-orm/pg-core";
import { version, timestamps } from "./columns";
import { users } from "./auth";
import { INVITATION_STATUSES } from "@shared/schemas/api";
import { ROLES } from "@shared/schemas/common";

// ---- workspace, members, suppliers --------------------------------------------
export const workspaces = pgTable("workspaces", {
  id: uuid("id").primaryKey().defaultRandom(),
  name: text("name").notNull(),
  /** Set on the workspace the seed creates; the seed never writes into any other. */
  isDemo: boolean("is_demo").default(false).notNull(),
  /** Most work (trials × attitudes) one study may ask for; null: the product's default (shared/schemas/studies). */
  studyWorkBudget: bigint("study_work_budget", { mode: "number" }),
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
    role: text("role", { enum: ROLES }).notNull(),
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
    role: text("role", { enum: ROLES }).notNull(),
    supplierId: uuid("supplier_id").references(() => suppliers.id, { onDelete: "cascade" }),
    token: text("token").notNull().unique(),
    status: text("status", { enum: INVITATION_STATUSES }).notNull().default("pending"),
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
  // the projects list: one workspace's projects in name order, read from the index
  (t) => [index("projects_workspace_name_idx").on(t.workspaceId, t.name)],
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
