import { z } from "zod";
import { MEASURE_UNITS } from "../datasets/units";
import { IdSchema } from "./common";

/** Limits of an uploaded measurement file. */
export const DATASET_MAX_BYTES = 5 * 1024 * 1024;
export const DATASET_MAX_ROWS = 100_000;
export const DATASET_MAX_COLUMNS = 200;
export const DATASET_PREVIEW_ROWS = 20;

export const MeasureUnitSchema = z.enum(MEASURE_UNITS, { message: "unit must be one of um, mm, deg, mrad, arcmin" });
export const DatasetFileTypeSchema = z.enum(["csv", "xlsx"]);

const ColumnSummarySchema = z.object({ n: z.number().int(), mean: z.number(), std: z.number(), min: z.number(), max: z.number() });

export const ColumnMappingSchema = z.object({
  revisionId: IdSchema,
  revisionNumber: z.number().int(),
  source: z.string(),
  /** the column's unit; the values are converted to the source's unit (um or deg) */
  unit: MeasureUnitSchema,
  sourceUnit: z.enum(["um", "deg"]),
  /** subtracted from every value (column unit) before conversion: the design value of an absolute measurement */
  nominal: z.number(),
  updatedByName: z.string().nullable(),
  updatedAt: z.string(),
});
export type ColumnMapping = z.infer<typeof ColumnMappingSchema>;

export const DatasetColumnSchema = z.object({
  /** the header exactly as in the file; unique within the data set */
  key: z.string(),
  name: z.string(),
  /** spreadsheet letter of the column in the file: A, B, … */
  letter: z.string(),
  unit: MeasureUnitSchema.nullable(),
  kind: z.enum(["number", "label"]),
  summary: ColumnSummarySchema.nullable(),
  mapping: ColumnMappingSchema.nullable(),
});
export type DatasetColumn = z.infer<typeof DatasetColumnSchema>;

export const DatasetSummarySchema = z.object({
  id: IdSchema,
  projectId: IdSchema,
  name: z.string(),
  fileType: DatasetFileTypeSchema,
  sheet: z.string().nullable(),
  sizeBytes: z.number().int(),
  rows: z.number().int(),
  columnCount: z.number().int(),
  mappedColumns: z.array(z.object({ column: z.string(), source: z.string() })),
  uploadedByName: z.string().nullable(),
  uploadedByRole: z.string(),
  supplierName: z.string().nullable(),
  report: z.object({ id: IdSchema, number: z.number().int(), revision: z.number().int() }).nullable(),
  createdAt: z.string(),
});
export type DatasetSummary = z.infer<typeof DatasetSummarySchema>;
export const DatasetListSchema = z.object({ datasets: z.array(DatasetSummarySchema) });

export const DatasetSchema = DatasetSummarySchema.extend({
  columns: z.array(DatasetColumnSchema),
  /** the first rows as written in the file, with their row numbers in the file */
  preview: z.object({ rowNumbers: z.array(z.number().int()), cells: z.array(z.array(z.string())) }),
  sha256: z.string(),
});
export type Dataset = z.infer<typeof DatasetSchema>;

export const MappingInputSchema = z.object({
  column: z.string({ message: "column is required" }).min(1, { message: "column is required" }),
  revisionId: IdSchema,
  /** a source id of the revision's stack, e.g. "mag.yaw"; null removes the mapping */
  source: z.string().min(1, { message: "source must not be empty" }).max(200).nullable(),
  unit: MeasureUnitSchema.optional(),
  nominal: z.number({ message: "nominal must be a number" }).finite({ message: "nominal must be a finite number" }).optional(),
});
export type MappingInput = z.infer<typeof MappingInputSchema>;
export const UpdateMappingsSchema = z.object({
  mappings: z.array(MappingInputSchema, { message: "mappings must be a list" }).min(1, { message: "give at least one mapping" }).max(DATASET_MAX_COLUMNS),
});
export type UpdateMappings = z.infer<typeof UpdateMappingsSchema>;

export const StatisticsQuerySchema = z.object({ column: z.string({ message: "name the column: ?column=…" }).min(1, { message: "name the column: ?column=…" }) });

export const DatasetStatisticsSchema = z.object({
  column: z.string(),
  /** unit of every number below: the source's unit when mapped, else the column's own (or none) */
  unit: z.string().nullable(),
  converted: z.object({ from: MeasureUnitSchema, factor: z.number(), nominal: z.number() }).nullable(),
  source: z.string().nullable(),
  summary: z.object({
    n: z.number().int(),
    mean: z.number(),
    std: z.number(),
    min: z.number(),
    max: z.number(),
    median: z.number(),
    q1: z.number(),
    q3: z.number(),
  }),
  normality: z
    .object({ method: z.literal("anderson-darling"), a2: z.number(), a2Star: z.number(), pValue: z.number(), normalAt5pct: z.boolean() })
    .nullable(),
  normalityNote: z.string().nullable(),
  tolerance: z
    .object({ dist: z.string(), tol: z.number().nullable(), sigmas: z.number().nullable(), mean: z.number(), sigma: z.number().nullable() })
    .nullable(),
  capability: z
    .object({
      lsl: z.number(),
      usl: z.number(),
      cp: z.number(),
      cpk: z.number(),
      expectedPpm: z.number(),
      observedOut: z.number().int(),
      observedPpm: z.number(),
    })
    .nullable(),
  outliers: z.object({
    rule: z.string(),
    /** row numbers are the file's own (the header is row 1) */
    values: z.array(z.object({ row: z.number().int(), value: z.number(), score: z.number() })),
  }),
  histogram: z.object({
    bins: z.array(z.object({ from: z.number(), to: z.number(), count: z.number().int() })),
    curve: z.array(z.object({ x: z.number(), y: z.number() })),
    domain: z.tuple([z.number(), z.number()]),
  }),
});
export type DatasetStatistics = z.infer<typeof DatasetStatisticsSchema>;

/** One tolerance source of a study replaced by a measured column (the "as built" study). */
export const AsBuiltEntrySchema = z.object({
  source: z.string({ message: "source is required" }).min(1, { message: "source is required" }).max(200),
  datasetId: IdSchema,
  column: z.string({ message: "column is required" }).min(1, { message: "column is required" }),
  mode: z.enum(["resample", "normal"], { message: 'mode must be "resample" or "normal"' }),
});
export type AsBuiltEntry = z.infer<typeof AsBuiltEntrySchema>;

/** What a study records of each replaced source. */
export const AsBuiltRecordSchema = AsBuiltEntrySchema.extend({
  datasetName: z.string(),
  n: z.number().int(),
  /** of the values as drawn, in the source's unit */
  mean: z.number(),
  std: z.number(),
  unit: z.enum(["um", "deg"]),
  /** the design tolerance the data replaced */
  replaced: z.record(z.string(), z.unknown()),
});
export type AsBuiltRecord = z.infer<typeof AsBuiltRecordSchema>;
