import * as z from "zod";
import { IdSchema, RoleSchema, text, VersionBodySchema, VersionSchema } from "./common";

export * from "./common";

const NAME_MAX = 120;
const trimmedName = (what: string) =>
  z
    .string({ message: `${what} is required` })
    .trim()
    .min(1, { message: `${what} must not be empty` })
    .max(NAME_MAX, { message: `${what} must be at most ${NAME_MAX} characters` });
const email = text({ message: "e-mail address is required" }).trim().toLowerCase().email({ message: "must be a valid e-mail address" });

// ---- me -------------------------------------------------------------------
export const MeSchema = z.object({
  user: z.object({ id: text(), name: text(), email: text() }),
  role: RoleSchema,
  workspace: z.object({ id: IdSchema, name: text() }),
  supplierId: IdSchema.nullable(),
});
export type Me = z.infer<typeof MeSchema>;

// ---- projects ---------------------------------------------------------------
export const ProjectSchema = z.object({
  id: IdSchema,
  name: text(),
  description: text(),
  ownerId: text().nullable(),
  ownerName: text().nullable(),
  createdAt: text(),
  updatedAt: text(),
  /** Set when archived: read-only, hidden from the default list. */
  archivedAt: text().nullable(),
  version: VersionSchema,
  lastStudy: z.object({ id: IdSchema, status: text(), passes: z.boolean().nullable(), finishedAt: text().nullable() }).nullable(),
});
export type Project = z.infer<typeof ProjectSchema>;
export const ProjectListSchema = z.object({ projects: z.array(ProjectSchema) });

export const ProjectListQuerySchema = z.object({
  q: text().trim().max(NAME_MAX).optional(),
  /** Archived projects are left out unless asked for: "only" them, or "all". */
  archived: z.enum(["only", "all"], { message: "archived must be only or all" }).optional(),
});
export const DeleteProjectQuerySchema = z.object({
  /** The project's name, typed by an admin to delete a project that holds kept records. */
  confirm: z
    .string()
    .max(NAME_MAX + 10, { message: "confirm is too long" })
    .optional(),
});
export const CreateProjectSchema = z.object({
  name: trimmedName("Project name"),
  description: text().trim().max(2000, { message: "description must be at most 2000 characters" }).default(""),
});
export type CreateProject = z.infer<typeof CreateProjectSchema>;
export const UpdateProjectSchema = z
  .object({
    name: trimmedName("Project name").optional(),
    description: text().trim().max(2000, { message: "description must be at most 2000 characters" }).optional(),
    ...VersionBodySchema.shape,
  })
  .refine((v) => v.name !== undefined || v.description !== undefined, { message: "give a name or a description to change" });
export type UpdateProject = z.infer<typeof UpdateProjectSchema>;

// ---- suppliers --------------------------------------------------------------
export const SupplierContactSchema = z.object({
  id: IdSchema,
  name: text(),
  email: text(),
  /** the contact can sign in (a supplier member with this address) */ hasAccount: z.boolean(),
});
export const SupplierSchema = z.object({
  id: IdSchema,
  name: text(),
  kind: text(),
  contacts: z.array(SupplierContactSchema),
  createdAt: text(),
  version: VersionSchema,
});
export type Supplier = z.infer<typeof SupplierSchema>;
export const SupplierListSchema = z.object({ suppliers: z.array(SupplierSchema) });
export const SupplierKindSchema = z.enum(["assembly", "substrate", "die", "board", "other"], {
  message: "kind must be one of assembly, substrate, die, board, other",
});
export const CreateSupplierSchema = z.object({
  name: trimmedName("Supplier name"),
  kind: SupplierKindSchema.default("other"),
});
export const UpdateSupplierSchema = z.object({
  name: trimmedName("Supplier name").optional(),
  kind: SupplierKindSchema.optional(),
  ...VersionBodySchema.shape,
});
export const CreateContactSchema = z.object({ name: trimmedName("Contact name"), email });

// ---- members and invitations ------------------------------------------------
export const MemberSchema = z.object({
  id: IdSchema,
  userId: text(),
  name: text(),
  email: text(),
  role: RoleSchema,
  supplierId: IdSchema.nullable(),
  supplierName: text().nullable(),
  createdAt: text(),
});
export type Member = z.infer<typeof MemberSchema>;
export const MemberListSchema = z.object({ members: z.array(MemberSchema) });
export const UpdateMemberSchema = z.object({ role: RoleSchema, supplierId: IdSchema.nullable().optional() });

export const INVITATION_STATUSES = ["pending", "accepted", "revoked"] as const;
export const InvitationStatusSchema = z.enum(INVITATION_STATUSES);
export const InvitationSchema = z.object({
  id: IdSchema,
  email: text(),
  role: RoleSchema,
  supplierId: IdSchema.nullable(),
  status: InvitationStatusSchema,
  link: text().nullable(),
  createdAt: text(),
  expiresAt: text(),
  /** only when just created: whether the link went out by e-mail (the link above stays valid either way) */
  mailed: z.boolean().optional(),
});
export type Invitation = z.infer<typeof InvitationSchema>;
export const InvitationListSchema = z.object({ invitations: z.array(InvitationSchema) });
export const CreateInvitationSchema = z
  .object({ email, role: RoleSchema, supplierId: IdSchema.nullable().optional() })
  .refine((v) => v.role !== "supplier" || !!v.supplierId, {
    message: "a supplier user must belong to a supplier company",
    path: ["supplierId"],
  });
export const InvitationTokenParamsSchema = z.object({ token: text().min(20).max(200) });
export const InvitationPreviewSchema = z.object({ email: text(), role: RoleSchema, workspaceName: text() });
const newPassword = z
  .string({ message: "password is required" })
  .min(10, { message: "password must be at least 10 characters" })
  .max(128, { message: "password must be at most 128 characters" });

/** What a signed-in person may change of their own account through the auth routes: the name only. */
export const AccountUpdateSchema = z.object({ name: trimmedName("Your name") }).strict();

export const AcceptInvitationSchema = z.object({
  name: trimmedName("Your name"),
  password: newPassword,
});
/** Accepting answers only that it worked; the session comes as a cookie. */
export const AcceptedInvitationSchema = z.object({ ok: z.literal(true) });

/** Changing one's own password (better-auth's change-password; the server ends the other sessions). */
export const ChangePasswordSchema = z.object({
  currentPassword: z.string({ message: "current password is required" }).min(1, { message: "current password is required" }).max(128),
  newPassword,
});

/** Setting a password from a reset link an admin sent. */
export const ResetPasswordSchema = z.object({ newPassword });

/** What an admin's "send a reset link" answers: whether the mail went, and until when the link works. */
export const ResetLinkSentSchema = z.object({ mailed: z.boolean(), expiresAt: z.string() });
export type ResetLinkSent = z.infer<typeof ResetLinkSentSchema>;

// ---- activity ---------------------------------------------------------------
export const ActivitySchema = z.object({
  id: IdSchema,
  projectId: IdSchema.nullable(),
  actorName: text().nullable(),
  action: text(),
  summary: text(),
  createdAt: text(),
});
export const ActivityListSchema = z.object({ activity: z.array(ActivitySchema) });
