import { z } from "zod";
import { IdSchema, RoleSchema } from "./common";

export * from "./common";

const NAME_MAX = 120;
const trimmedName = (what: string) =>
  z
    .string({ message: `${what} is required` })
    .trim()
    .min(1, { message: `${what} must not be empty` })
    .max(NAME_MAX, { message: `${what} must be at most ${NAME_MAX} characters` });
const email = z.string({ message: "e-mail address is required" }).trim().toLowerCase().email({ message: "must be a valid e-mail address" });

// ---- me -------------------------------------------------------------------
export const MeSchema = z.object({
  user: z.object({ id: z.string(), name: z.string(), email: z.string() }),
  role: RoleSchema,
  workspace: z.object({ id: IdSchema, name: z.string() }),
  supplierId: IdSchema.nullable(),
});
export type Me = z.infer<typeof MeSchema>;

// ---- projects ---------------------------------------------------------------
export const ProjectSchema = z.object({
  id: IdSchema,
  name: z.string(),
  description: z.string(),
  ownerId: z.string().nullable(),
  ownerName: z.string().nullable(),
  createdAt: z.string(),
  updatedAt: z.string(),
  /** Set when archived: read-only, hidden from the default list. */
  archivedAt: z.string().nullable(),
  lastStudy: z.object({ id: IdSchema, status: z.string(), passes: z.boolean().nullable(), finishedAt: z.string().nullable() }).nullable(),
});
export type Project = z.infer<typeof ProjectSchema>;
export const ProjectListSchema = z.object({ projects: z.array(ProjectSchema) });

export const ProjectListQuerySchema = z.object({
  q: z.string().trim().max(NAME_MAX).optional(),
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
  description: z.string().trim().max(2000, { message: "description must be at most 2000 characters" }).default(""),
});
export type CreateProject = z.infer<typeof CreateProjectSchema>;
export const UpdateProjectSchema = z
  .object({
    name: trimmedName("Project name").optional(),
    description: z.string().trim().max(2000, { message: "description must be at most 2000 characters" }).optional(),
  })
  .refine((v) => v.name !== undefined || v.description !== undefined, { message: "give a name or a description to change" });
export type UpdateProject = z.infer<typeof UpdateProjectSchema>;

// ---- suppliers --------------------------------------------------------------
export const SupplierContactSchema = z.object({ id: IdSchema, name: z.string(), email: z.string() });
export const SupplierSchema = z.object({
  id: IdSchema,
  name: z.string(),
  kind: z.string(),
  contacts: z.array(SupplierContactSchema),
  createdAt: z.string(),
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
});
export const CreateContactSchema = z.object({ name: trimmedName("Contact name"), email });

// ---- members and invitations ------------------------------------------------
export const MemberSchema = z.object({
  id: IdSchema,
  userId: z.string(),
  name: z.string(),
  email: z.string(),
  role: RoleSchema,
  supplierId: IdSchema.nullable(),
  supplierName: z.string().nullable(),
  createdAt: z.string(),
});
export type Member = z.infer<typeof MemberSchema>;
export const MemberListSchema = z.object({ members: z.array(MemberSchema) });
export const UpdateMemberSchema = z.object({ role: RoleSchema, supplierId: IdSchema.nullable().optional() });

export const InvitationSchema = z.object({
  id: IdSchema,
  email: z.string(),
  role: RoleSchema,
  supplierId: IdSchema.nullable(),
  status: z.enum(["pending", "accepted", "revoked"]),
  link: z.string().nullable(),
  createdAt: z.string(),
  expiresAt: z.string(),
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
export const InvitationTokenParamsSchema = z.object({ token: z.string().min(20).max(200) });
export const InvitationPreviewSchema = z.object({ email: z.string(), role: RoleSchema, workspaceName: z.string() });
export const AcceptInvitationSchema = z.object({
  name: trimmedName("Your name"),
  password: z
    .string({ message: "password is required" })
    .min(10, { message: "password must be at least 10 characters" })
    .max(128, { message: "password must be at most 128 characters" }),
});

// ---- activity ---------------------------------------------------------------
export const ActivitySchema = z.object({
  id: IdSchema,
  projectId: IdSchema.nullable(),
  actorName: z.string().nullable(),
  action: z.string(),
  summary: z.string(),
  createdAt: z.string(),
});
export const ActivityListSchema = z.object({ activity: z.array(ActivitySchema) });
