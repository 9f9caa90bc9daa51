/**
 * Supplier tolerance reports: API bodies, responses, and the frozen content a report is
 * printed from. Limits are named so the client's forms and the server agree.
 */
import * as z from "zod";
import { DEFAULT_CPK, MAX_CPK, MIN_CPK } from "../reports/capability";
import { IdSchema, text, VersionBodySchema, VersionSchema } from "./common";
import { EnvelopeSchema } from "./result-file";
import { CommentSchema } from "./revisions";

export const REPORT_STATUSES = ["draft", "released"] as const;
export const ReportStatusSchema = z.enum(REPORT_STATUSES);
/** The capability a report asks of its supplier: one Cpk, and overrides by tolerance source id. */
export const ReportCapabilitySchema = z.object({ cpk: z.number(), overrides: z.record(text(), z.number()) });
export type ReportCapability = z.infer<typeof ReportCapabilitySchema>;
export type ReportStatus = z.infer<typeof ReportStatusSchema>;
export const REPORT_FILE_KINDS = ["pdf", "xlsx", "csv"] as const;
export const ReportFileKindSchema = z.enum(REPORT_FILE_KINDS, { message: "the file must be pdf, xlsx or csv" });
export type ReportFileKind = z.infer<typeof ReportFileKindSchema>;

/** Largest 3D snapshot accepted, as data-URL text (about 1.4 MB of PNG). */
export const SNAPSHOT_MAX_CHARS = 1_900_000;
export const NOTE_MAX = 2000;

const cpk = (what: string) =>
  z
    .number({ message: `${what} must be a number` })
    .min(MIN_CPK, { message: `${what} must be at least ${MIN_CPK}` })
    .max(MAX_CPK, { message: `${what} must be at most ${MAX_CPK}` });

export const PngDataUrlSchema = z
  .string({ message: "snapshotPng must be a PNG data URL" })
  .max(SNAPSHOT_MAX_CHARS, { message: "the snapshot is too large: export it at most about 1.4 MB" })
  .regex(/^data:image\/png;base64,[A-Za-z0-9+/]+={0,2}$/, {
    message: "snapshotPng must be a data URL of a PNG image (data:image/png;base64,…)",
  });

const overrides = z
  .record(text().min(1).max(140), cpk("a capability override"), { message: "cpkOverrides must map source ids to a Cpk" })
  .refine((o) => Object.keys(o).length <= 500, { message: "at most 500 overrides" });

const note = z
  .string({ message: "note must be text" })
  .trim()
  .max(NOTE_MAX, { message: `note must be at most ${NOTE_MAX} characters` });

export const CreateReportSchema = z.object({
  supplierId: IdSchema,
  cpk: cpk("cpk").default(DEFAULT_CPK),
  cpkOverrides: overrides.default({}),
  note: note.default(""),
  snapshotPng: PngDataUrlSchema.optional(),
});
export type CreateReport = z.infer<typeof CreateReportSchema>;

export const UpdateReportSchema = z
  .object({
    cpk: cpk("cpk").optional(),
    cpkOverrides: overrides.optional(),
    note: note.optional(),
    /** null removes the snapshot (the PDF then draws the schematic side view) */
    snapshotPng: PngDataUrlSchema.nullable().optional(),
    ...VersionBodySchema.shape,
  })
  .refine(({ version: _v, ...v }) => Object.values(v).some((x) => x !== undefined), {
    message: "give cpk, cpkOverrides, note or snapshotPng to change",
  });
export type UpdateReport = z.infer<typeof UpdateReportSchema>;

export const ReportListQuerySchema = z.object({
  projectId: IdSchema.optional(),
  supplierId: IdSchema.optional(),
  status: ReportStatusSchema.optional(),
});

const shortText = (what: string) =>
  z
    .string({ message: `${what} must be text` })
    .trim()
    .max(NOTE_MAX, { message: `${what} must be at most ${NOTE_MAX} characters` });
export const ReleaseReportSchema = z.object({ comment: shortText("comment").optional(), ...VersionBodySchema.shape });
/** Most addresses a send may copy in. */
export const MAX_CC = 10;
const ccAddress = text({ message: "each CC must be an e-mail address" })
  .trim()
  .toLowerCase()
  .email({ message: "must be a valid e-mail address" });
export const SendReportSchema = z.object({
  message: shortText("message").optional(),
  /** the supplier's contacts who receive it; left out: every contact */
  contactIds: z
    .array(IdSchema, { message: "contactIds must be a list of contact ids" })
    .min(1, { message: "choose at least one of the supplier's contacts" })
    .max(200)
    .optional(),
  /** further addresses that get a copy (a colleague, the supplier's quality inbox) */
  cc: z
    .array(ccAddress, { message: "cc must be a list of e-mail addresses" })
    .max(MAX_CC, { message: `at most ${MAX_CC} CC addresses` })
    .default([]),
  /** the released files attached to the mail; the link is always there */
  attachments: z
    .array(ReportFileKindSchema, { message: "attachments must be a list of pdf, xlsx and csv" })
    .max(3)
    .refine((a) => new Set(a).size === a.length, { message: "name each attachment once" })
    .default(["pdf"]),
});
export type SendReport = z.input<typeof SendReportSchema>;
export const AcknowledgeReportSchema = z.object({ comment: shortText("comment").optional(), ...VersionBodySchema.shape });

// ---- the frozen content -----------------------------------------------------------
export const ReportToleranceSchema = z.object({
  source: text(),
  elementId: text(),
  elementName: text(),
  elementKind: text(),
  quantity: text(),
  unit: z.enum(["um", "deg"]),
  stage: text(),
  dist: z.enum(["normal", "uniform", "triangular", "data"]),
  /** ± half-width; null for a measured data set */
  tol: z.number().nullable(),
  sigmas: z.number().nullable(),
  mean: z.number(),
  draws: z.number().int(),
  owner: text(),
  cpk: z.number(),
  cpkChosen: z.number(),
  raised: z.boolean(),
  sigmaMax: z.number().nullable(),
  sigmaModelled: z.number().nullable(),
  /** the requirements this source contributes to, with its share there */
  feeds: z.array(z.object({ metric: text(), share: z.number() })),
});
export type ReportTolerance = z.infer<typeof ReportToleranceSchema>;

export const ReportRequirementSchema = z.object({
  metric: text(),
  description: text(),
  unit: text(),
  max: z.number(),
  yield: z.number(),
  predictedYield: z.number(),
  ci: z.tuple([z.number(), z.number()]),
  ppmOut: z.number(),
  passes: z.boolean(),
  /** share of the metric's spread from this supplier's tolerances; null without contributor data */
  supplierShare: z.number().nullable(),
  /** true when the supplier's tolerances carry a noticeable share of it */
  fed: z.boolean(),
});
export type ReportRequirement = z.infer<typeof ReportRequirementSchema>;

export const ReportContributorChartSchema = z.object({
  metric: text(),
  description: text(),
  basis: z.enum(["variance", "meanSquare"]),
  bars: z.array(z.object({ source: text(), share: z.number(), ours: z.boolean() })),
  /** what the sources not drawn add up to */
  restShare: z.number(),
});

export const ReportStackElementSchema = z.object({
  id: text(),
  name: text(),
  kind: text(),
  parent: text().nullable(),
  size: z.object({ x: z.number(), y: z.number(), z: z.number() }),
  position: z.object({ x: z.number(), y: z.number() }),
  yawDeg: z.number(),
  bondThicknessUm: z.number(),
  /** support points in the element's frame (mm); absent in reports built before they were kept: the four corners */
  supports: z.array(z.object({ x: z.number(), y: z.number() })).optional(),
  /** this supplier's sources on the element */
  sources: z.array(text()),
});

export const ReportContentSchema = z.object({
  format: z.literal("orthostack.report/1"),
  builtAt: text(),
  project: z.object({ id: IdSchema, name: text() }),
  revision: z.object({
    id: IdSchema,
    number: z.number().int(),
    name: text(),
    approvedAt: text().nullable(),
    approvedByName: text().nullable(),
  }),
  study: z.object({
    id: IdSchema,
    number: z.number().int(),
    label: text(),
    finishedAt: text().nullable(),
    trials: z.number().int(),
    seed: z.number(),
    engine: text(),
    sampling: text(),
    inclinationDeg: z.number(),
    site: z.object({ latitudeDeg: z.number(), longitudeDeg: z.number(), altitudeKm: z.number(), date: text(), model: text() }).nullable(),
    calibration: z.object({ after: text(), residual: text().nullable() }),
    headingStepDeg: z.number(),
    tilts: z.array(z.object({ pitchDeg: z.number(), rollDeg: z.number() })),
    passes: z.boolean().nullable(),
  }),
  supplier: z.object({ id: IdSchema, name: text(), kind: text() }),
  capability: ReportCapabilitySchema,
  tolerances: z.array(ReportToleranceSchema),
  requirements: z.array(ReportRequirementSchema),
  contributors: z.array(ReportContributorChartSchema),
  envelope: EnvelopeSchema.nullable(),
  headingLimit: z.number().nullable(),
  stack: z.array(ReportStackElementSchema),
  cautions: z.array(text()),
});
export type ReportContent = z.infer<typeof ReportContentSchema>;

// ---- responses ------------------------------------------------------------------------
export const ReportSummarySchema = z.object({
  id: IdSchema,
  /** "TR-0007" */
  code: text(),
  number: z.number().int(),
  revision: z.number().int(),
  status: ReportStatusSchema,
  version: VersionSchema,
  projectId: IdSchema,
  projectName: text(),
  supplierId: IdSchema.nullable(),
  supplierName: text(),
  studyId: IdSchema.nullable(),
  studyNumber: z.number().int(),
  stackRevisionNumber: z.number().int(),
  toleranceCount: z.number().int(),
  cpk: z.number(),
  /** false when a later revision of the same report exists */
  isLatest: z.boolean(),
  createdAt: text(),
  createdByName: text().nullable(),
  releasedAt: text().nullable(),
  releasedByName: text().nullable(),
  acknowledgedAt: text().nullable(),
  acknowledgedByName: text().nullable(),
  lastSentAt: text().nullable(),
});
export type ReportSummary = z.infer<typeof ReportSummarySchema>;
export const ReportListSchema = z.object({ reports: z.array(ReportSummarySchema) });

export const ReportFileInfoSchema = z.object({
  kind: ReportFileKindSchema,
  fileName: text(),
  size: z.number().int(),
  sha256: text(),
  createdAt: text(),
});
export const ReportSendSchema = z.object({
  id: IdSchema,
  sentAt: text(),
  sentByName: text().nullable(),
  /** `cc` marks an address copied in beside the supplier's contacts */
  recipients: z.array(z.object({ name: text(), email: text(), cc: z.boolean().optional() })),
  message: text(),
  attachments: z.array(ReportFileKindSchema),
});
export const ReportDownloadSchema = z.object({ at: text(), userName: text().nullable(), role: text(), kind: text() });

export const ReportSchema = ReportSummarySchema.extend({
  capability: ReportCapabilitySchema,
  note: text(),
  hasSnapshot: z.boolean(),
  content: ReportContentSchema,
  /** stored files of a released report (empty for a draft) */
  files: z.array(ReportFileInfoSchema),
  sends: z.array(ReportSendSchema),
  downloads: z.array(ReportDownloadSchema),
  comments: z.array(CommentSchema),
  /** every revision of this report number the reader may see, newest first */
  history: z.array(
    z.object({
      id: IdSchema,
      revision: z.number().int(),
      status: ReportStatusSchema,
      createdAt: text(),
      releasedAt: text().nullable(),
    }),
  ),
  /** where the supplier's people open it */
  link: text(),
});
export type Report = z.infer<typeof ReportSchema>;

export const SendResultSchema = z.object({
  report: ReportSchema,
  sent: z.array(z.object({ name: text(), email: text(), cc: z.boolean().optional() })),
  /** contacts the mail server refused, with its reason */
  failed: z.array(z.object({ name: text(), email: text(), error: text() })),
});
export type SendResult = z.infer<typeof SendResultSchema>;

// ---- building: what a project offers ---------------------------------------------------
export const ReportOptionSupplierSchema = z.object({
  supplierId: IdSchema,
  name: text(),
  kind: text(),
  sources: z.array(text()),
  contacts: z.number().int(),
  /** the newest revision of this supplier's report on the project, if any */
  latest: z.object({ id: IdSchema, code: text(), revision: z.number().int(), status: ReportStatusSchema }).nullable(),
});
export const ReportOptionStudySchema = z.object({
  id: IdSchema,
  number: z.number().int(),
  label: text(),
  status: text(),
  revisionId: IdSchema,
  revisionNumber: z.number().int(),
  revisionStatus: text(),
  finishedAt: text().nullable(),
  passes: z.boolean().nullable(),
  /** the requirements the study predicts to miss their yield target */
  missed: z.array(z.object({ metric: text(), label: text(), yield: z.number(), predictedYield: z.number() })),
  /** null when a report can be built from this study; otherwise why not */
  blockedBy: text().nullable(),
  suppliers: z.array(ReportOptionSupplierSchema),
  /** owner texts that name no supplier company (in-house steps, typos) */
  unmatchedOwners: z.array(z.object({ owner: text(), sources: z.array(text()) })),
  unowned: z.array(text()),
});
export const ReportOptionsSchema = z.object({ studies: z.array(ReportOptionStudySchema) });
export type ReportOptions = z.infer<typeof ReportOptionsSchema>;

// ---- outbox -------------------------------------------------------------------------
export const OutboxMessageSchema = z.object({
  id: IdSchema,
  from: text(),
  to: z.array(text()),
  subject: text(),
  receivedAt: text(),
  size: z.number().int(),
  text: text(),
  attachments: z.array(z.object({ index: z.number().int(), fileName: text(), contentType: text(), size: z.number().int() })),
});
export type OutboxMessage = z.infer<typeof OutboxMessageSchema>;
export const OutboxSchema = z.object({
  /** "catcher": mail stays on this machine and shows here; "smtp": it leaves through a server */
  mode: z.enum(["catcher", "smtp", "off"]),
  address: text().nullable(),
  messages: z.array(OutboxMessageSchema),
});
export const OutboxAttachmentParamsSchema = z.object({
  id: IdSchema,
  index: z.coerce
    .number({ message: "index must be a number" })
    .int({ message: "index must be a whole number" })
    .min(0, { message: "index cannot be negative" })
    .max(100, { message: "index is at most 100" }),
});
