import * as z from "zod";
import { IdSchema, text, VersionBodySchema, VersionSchema } from "./common";
import { RequirementSchema, type Requirement } from "./study-file";
import { GeometryWarningSchema } from "./stack-help";
import { StackFileObjectSchema } from "./stack-file";

export const REVISION_STATUSES = ["draft", "in_review", "approved"] as const;
export const RevisionStatusSchema = z.enum(REVISION_STATUSES);
export type RevisionStatus = z.infer<typeof RevisionStatusSchema>;

export { RequirementSchema, type Requirement };
export const RequirementsSchema = z.array(RequirementSchema).max(200, { message: "at most 200 requirements" });

/** The stack itself is checked by the engine's validator (shared/schemas/stack-file). */
export const CreateRevisionSchema = z.object({
  stack: z.unknown().refine((v) => v !== undefined, { message: "stack is required" }),
  requirements: RequirementsSchema.optional(),
  note: text().trim().max(2000, { message: "note must be at most 2000 characters" }).optional(),
});
export const UpdateRevisionSchema = z
  .object({
    stack: z.unknown().optional(),
    requirements: RequirementsSchema.optional(),
    note: text().trim().max(2000, { message: "note must be at most 2000 characters" }).optional(),
    ...VersionBodySchema.shape,
  })
  .refine((v) => v.stack !== undefined || v.requirements !== undefined || v.note !== undefined, {
    message: "give a stack, requirements or a note to change",
  });
export const ReturnRevisionSchema = z.object({
  comment: z
    .string({ message: "say why the revision goes back" })
    .trim()
    .min(1, { message: "say why the revision goes back" })
    .max(4000, { message: "comment must be at most 4000 characters" }),
  ...VersionBodySchema.shape,
});
/** Approving: an optional comment beside the approval. */
export const ApproveRevisionSchema = z.object({
  comment: text().trim().max(4000, { message: "comment must be at most 4000 characters" }).optional(),
  ...VersionBodySchema.shape,
});
export const CommentBodySchema = z.object({
  body: z
    .string({ message: "comment is required" })
    .trim()
    .min(1, { message: "comment must not be empty" })
    .max(4000, { message: "comment must be at most 4000 characters" }),
});

export const CommentSchema = z.object({
  id: IdSchema,
  authorName: text().nullable(),
  kind: text(),
  body: text(),
  createdAt: text(),
});
export type Comment = z.infer<typeof CommentSchema>;
/** What adding a comment answers: the record's comments, the new one included (revisions and reports). */
export const CommentListSchema = z.object({ comments: z.array(CommentSchema) });

export const RevisionSummarySchema = z.object({
  id: IdSchema,
  projectId: IdSchema,
  number: z.number().int(),
  status: RevisionStatusSchema,
  version: VersionSchema,
  name: text(),
  note: text(),
  basedOnId: IdSchema.nullable(),
  createdByName: text().nullable(),
  approvedByName: text().nullable(),
  createdAt: text(),
  updatedAt: text(),
  submittedAt: text().nullable(),
  approvedAt: text().nullable(),
});
export type RevisionSummary = z.infer<typeof RevisionSummarySchema>;
export const RevisionSchema = RevisionSummarySchema.extend({
  /** the stack file of MODEL.md §9 (every stored stack was checked by the stack file's validator) */
  stack: StackFileObjectSchema,
  requirements: RequirementsSchema,
  comments: z.array(CommentSchema),
  /** geometry slips of the stack (overhang, overlap, clearance, body height); never block saving */
  warnings: z.array(GeometryWarningSchema),
});
export type Revision = z.infer<typeof RevisionSchema>;
export const RevisionListSchema = z.object({ revisions: z.array(RevisionSummarySchema) });

/** `GET /api/revisions/:id/diff[?against=:otherId]`: what changed, in words and units. */
export const RevisionDiffQuerySchema = z.object({ against: IdSchema.optional() });
const DiffValueSchema = z.union([text(), z.number(), z.boolean(), z.null()]);
export const StackChangeSchema = z.object({
  path: text(),
  label: text(),
  kind: z.enum(["added", "removed", "changed"]),
  before: DiffValueSchema,
  after: DiffValueSchema,
  unit: text().nullable(),
});
export const RevisionDiffSchema = z.object({
  /** The revision compared with; null for a project's first revision (nothing to compare). */
  against: z.object({ id: IdSchema, number: z.number().int() }).nullable(),
  changes: z.array(StackChangeSchema),
});
export type RevisionDiff = z.infer<typeof RevisionDiffSchema>;
/**
 * Submitting: the note says what changed and why; asked for on every revision after the first.
 * A draft whose requirements fail is refused (409 `requirements_not_met`) unless `confirmFailing`
 * says the engineer has seen what fails (`GET /api/revisions/:id/requirement-check`).
 */
export const SubmitRevisionSchema = z.object({
  note: text().trim().max(2000, { message: "note must be at most 2000 characters" }).optional(),
  confirmFailing: z.boolean({ message: "confirmFailing must be true or false" }).optional(),
  ...VersionBodySchema.shape,
});

/** Where a requirement's predicted yield comes from: a finished study of this stack, else the live estimate. */
export const CheckSourceSchema = z.discriminatedUnion("kind", [
  z.object({ kind: z.literal("study"), studyId: IdSchema, number: z.number().int() }),
  z.object({ kind: z.literal("estimate"), trials: z.number().int(), inclinationDeg: z.number() }),
]);
export type CheckSource = z.infer<typeof CheckSourceSchema>;
export const RequirementCheckSchema = z.object({
  /** index in the revision's requirement list */
  index: z.number().int(),
  metric: text(),
  /** the requirement's own name, else the metric's (shared/metrics.ts) */
  label: text(),
  unit: z.enum(["%", "deg"]),
  /** the limit on |value| */
  max: z.number(),
  /** the yield asked (a fraction) and the one predicted */
  target: z.number(),
  reached: z.number(),
  passes: z.boolean(),
  source: CheckSourceSchema,
});
export type RequirementCheck = z.infer<typeof RequirementCheckSchema>;
/** `GET /api/revisions/:id/requirement-check`: each requirement judged, and the ones that fail. */
export const RevisionCheckSchema = z.object({
  requirements: z.array(RequirementCheckSchema),
  failing: z.array(RequirementCheckSchema),
});
export type RevisionCheck = z.infer<typeof RevisionCheckSchema>;
