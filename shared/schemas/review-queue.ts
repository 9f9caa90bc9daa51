import * as z from "zod";
import { IdSchema, text } from "./common";

/**
 * What waits for the signed-in person (GET /api/review-queue): for a reviewer, the revisions
 * submitted and the report drafts ready for release; for an engineer, their revisions and report
 * drafts sent back and their released reports with a supplier's question not yet answered.
 */
export const WORK_KINDS = ["revision.review", "report.release", "revision.returned", "report.returned", "report.question"] as const;
export const WorkKindSchema = z.enum(WORK_KINDS);
export type WorkKind = z.infer<typeof WorkKindSchema>;

/** The groups of the home page, in words. */
export const WORK_KIND_LABELS: Record<WorkKind, string> = {
  "revision.review": "Revisions waiting for review",
  "report.release": "Reports ready for release",
  "revision.returned": "Your revisions sent back",
  "report.returned": "Your report drafts sent back",
  "report.question": "Supplier questions on your reports",
};

export const WorkItemSchema = z.object({
  kind: WorkKindSchema,
  /** "Revision 3 of “Ridgeline”", "TR-0002 revision 1 for Larkfield Assembly" */
  title: text(),
  projectId: IdSchema,
  projectName: text(),
  /** the app path that opens it */
  link: text(),
  /** since when it waits (ISO) */
  since: text(),
  /** who submitted, built, sent back or asked */
  by: text().nullable(),
});
export type WorkItem = z.infer<typeof WorkItemSchema>;

/** Per open project, what waits for a reviewer there (the same for everyone on the staff). */
export const ProjectAwaitingSchema = z.object({
  projectId: IdSchema,
  revisions: z.number().int(),
  reports: z.number().int(),
});
export type ProjectAwaiting = z.infer<typeof ProjectAwaitingSchema>;

export const ReviewQueueSchema = z.object({
  items: z.array(WorkItemSchema),
  awaitingReview: z.array(ProjectAwaitingSchema),
});
export type ReviewQueue = z.infer<typeof ReviewQueueSchema>;
