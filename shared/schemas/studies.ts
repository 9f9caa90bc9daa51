import * as z from "zod";
import { IdSchema, text } from "./common";
import { AsBuiltEntrySchema, AsBuiltRecordSchema } from "./datasets";
import { ResultFileSchema } from "./result-file";
import { FieldAtSiteSchema, SiteSchema } from "./site";
import { StackFileObjectSchema } from "./stack-file";
import { StudyFileObjectSchema } from "./study-file";

export const STUDY_STATUSES = ["queued", "running", "finished", "failed", "cancelled", "interrupted"] as const;
export const StudyStatusSchema = z.enum(STUDY_STATUSES);
export type StudyStatus = z.infer<typeof StudyStatusSchema>;

/**
 * Starting a study: the study file of MODEL.md (checked against the revision's stack by the
 * engine's validator), optionally a site whose WMM inclination replaces `inclinationDeg`.
 */
export const CreateStudySchema = z.object({
  study: z.record(text(), z.unknown(), { message: "study must be a study file (an object)" }),
  site: SiteSchema.optional(),
  label: text().trim().max(120, { message: "label must be at most 120 characters" }).optional(),
  /** As built: tolerance sources replaced by measured data sets in the frozen stack (issue 7). */
  asBuilt: z
    .array(AsBuiltEntrySchema, { message: "asBuilt must be a list" })
    .max(100, { message: "at most 100 as-built sources" })
    .optional(),
});
export type CreateStudy = z.infer<typeof CreateStudySchema>;

export const StudySummarySchema = z.object({
  id: IdSchema,
  projectId: IdSchema,
  revisionId: IdSchema,
  revisionNumber: z.number().int(),
  number: z.number().int(),
  label: text(),
  status: StudyStatusSchema,
  progress: z.object({ done: z.number().int(), total: z.number().int(), trialsPerSecond: z.number().nullable() }),
  trials: z.number().int(),
  seed: z.number(),
  passes: z.boolean().nullable(),
  error: text().nullable(),
  createdByName: text().nullable(),
  createdAt: text(),
  startedAt: text().nullable(),
  finishedAt: text().nullable(),
  /** The sources replaced by measured data (an "as built" study); empty for a design study. */
  asBuilt: z.array(AsBuiltRecordSchema.omit({ replaced: true })),
});
export type StudySummary = z.infer<typeof StudySummarySchema>;

/**
 * One study as `GET /api/studies/:id` answers it: the frozen study file and stack, and the
 * result file parsed with their own schemas, so every chart works on checked numbers.
 */
export const StudySchema = StudySummarySchema.extend({
  study: StudyFileObjectSchema,
  stack: StackFileObjectSchema,
  site: FieldAtSiteSchema.nullable(),
  /** The result file (MODEL.md §11) with its plot data, once finished (and only on the GET). */
  result: ResultFileSchema.nullable(),
});
export type Study = z.infer<typeof StudySchema>;
export const StudyListSchema = z.object({ studies: z.array(StudySummarySchema) });

export const CompareQuerySchema = z.object({ a: IdSchema, b: IdSchema });

/** `GET /api/studies/:id/export?format=csv|xlsx` */
export const StudyExportQuerySchema = z.object({
  format: z.enum(["csv", "xlsx"], { message: 'format must be "csv" or "xlsx"' }),
});

// ---- the work budget: how much one study may ask of the shared engine --------------

/**
 * A study's work is its trials times the attitudes of its compass sweep (one when no sweep
 * runs): the engine's time grows with both. The default lets the reference study (180
 * attitudes) run 10^7 trials; an admin can raise it for the workspace up to the most the
 * study file admits (10^7 trials × 20,000 attitudes).
 */
export const DEFAULT_STUDY_WORK_BUDGET = 2_000_000_000;
export const MAX_STUDY_WORK_BUDGET = 200_000_000_000;
export const MIN_STUDY_WORK_BUDGET = 1_000_000;

export const StudyBudgetSchema = z.object({
  budget: z.number(),
  defaultBudget: z.number(),
  maxBudget: z.number(),
  /**
   * Work (trial-attitudes) per second, the median over the workspace's recent finished
   * studies as this server ran them; null until one has finished.
   */
  workPerSecond: z.number().nullable(),
  measuredStudies: z.number().int(),
});
export type StudyBudget = z.infer<typeof StudyBudgetSchema>;

export const UpdateStudyBudgetSchema = z.object({
  budget: z
    .number({ message: "budget must be a number of trial-attitudes" })
    .int({ message: "budget must be a whole number" })
    .min(MIN_STUDY_WORK_BUDGET, { message: `budget is at least ${MIN_STUDY_WORK_BUDGET.toLocaleString("en-US")}` })
    .max(MAX_STUDY_WORK_BUDGET, { message: `budget is at most ${MAX_STUDY_WORK_BUDGET.toLocaleString("en-US")}` }),
});
