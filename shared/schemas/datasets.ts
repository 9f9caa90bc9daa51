import * as z from "zod";
import { MEASURE_UNITS } from "../datasets/units";
import { IdSchema, text, VersionBodySchema, VersionSchema } from "./common";

/** Limits of an uploaded measurement file. */
export const DATASET_MAX_BYTES = 5 * 1024 * 1024;
export const DATASET_MAX_ROWS = 100_000;
export const DATASET_MAX_COLUMNS = 200;
export const DATASET_PREVIEW_ROWS = 20;

export const MeasureUnitSchema = z.enum(MEASURE_UNITS, { message: "unit must be one of um, mm, deg, mrad, arcmin" });
export const DATASET_FILE_TYPES = ["csv", "xlsx"] as const;
export const DatasetFileTypeSchema = z.enum(DATASET_FILE_TYPES);

/** n values and the gaps (empty cells, NA, N/A, n/a, -, null) beside them */
const ColumnSummarySchema = z.object({
  n: z.number().int(),
  missing: z.number().int().default(0),
  mean: z.number(),
  std: z.number(),
  min: z.number(),
  max: z.number(),
});

export const ColumnMappingSchema = z.object({
  revisionId: IdSchema,
  revisionNumber: z.number().int(),
  source: text(),
  /** for a pooled source: which support point or component this column is (0-based), and its name */
  part: z.number().int().nullable(),
  partLabel: text().nullable(),
  /** the column's unit; the values are converted to the source's unit (um or deg) */
  unit: MeasureUnitSchema,
  sourceUnit: z.enum(["um", "deg"]),
  /** subtracted from every value (column unit) before conversion: the design value of an absolute measurement */
  nominal: z.number(),
  updatedByName: text().nullable(),
  updatedAt: text(),
});
export type ColumnMapping = z.infer<typeof ColumnMappingSchema>;

export const DatasetColumnSchema = z.object({
  /** the header exactly as in the file; unique within the data set */
  key: text(),
  name: text(),
  /** spreadsheet letter of the column in the file: A, B, … */
  letter: text(),
  unit: MeasureUnitSchema.nullable(),
  kind: z.enum(["number", "label"]),
  summary: ColumnSummarySchema.nullable(),
  mapping: ColumnMappingSchema.nullable(),
});
export type DatasetColumn = z.infer<typeof DatasetColumnSchema>;
/**
 * A column as the data set stores it (the `columns` JSON column): what the file gave, without its
 * mapping. Rows stored before gaps were counted have no `summary.missing` (read as 0).
 */
export const StoredColumnSchema = DatasetColumnSchema.omit({ mapping: true });
export type StoredColumn = z.input<typeof StoredColumnSchema>;
/** A column as the file reader makes it, gaps counted. */
export type ParsedColumn = z.output<typeof StoredColumnSchema>;

export const DatasetSummarySchema = z.object({
  id: IdSchema,
  projectId: IdSchema,
  name: text(),
  fileType: DatasetFileTypeSchema,
  sheet: text().nullable(),
  sizeBytes: z.number().int(),
  rows: z.number().int(),
  columnCount: z.number().int(),
  mappedColumns: z.array(z.object({ column: text(), source: text() })),
  uploadedByName: text().nullable(),
  uploadedByRole: text(),
  supplierName: text().nullable(),
  report: z.object({ id: IdSchema, number: z.number().int(), revision: z.number().int() }).nullable(),
  /** the production lot the sender gave for the whole file, and the sender's note */
  lot: text().nullable(),
  note: text().nullable(),
  /** a label column marked as each row's lot (or date) */
  lotColumn: text().nullable(),
  createdAt: text(),
  /** one counter for the data set's lot column and its column mappings */
  version: VersionSchema,
});
export type DatasetSummary = z.infer<typeof DatasetSummarySchema>;
export const DatasetListSchema = z.object({ datasets: z.array(DatasetSummarySchema) });

export const DatasetSchema = DatasetSummarySchema.extend({
  columns: z.array(DatasetColumnSchema),
  /** each source measured by several columns: the rows where all of them have a value are used */
  pooled: z.array(
    z.object({
      source: text(),
      revisionNumber: z.number().int(),
      columns: z.array(text()),
      /** parts of the source with no column yet (the as-built study needs all) */
      missingParts: z.array(text()),
      parts: z.number().int(),
      completeRows: z.number().int(),
      dropped: z.number().int(),
    }),
  ),
  /** the first rows as written in the file, with their row numbers in the file */
  preview: z.object({ rowNumbers: z.array(z.number().int()), cells: z.array(z.array(text())) }),
  sha256: text(),
});
export type Dataset = z.infer<typeof DatasetSchema>;

export const MappingInputSchema = z.object({
  column: text({ message: "column is required" }).min(1, { message: "column is required" }),
  revisionId: IdSchema,
  /** a source id of the revision's stack, e.g. "mag.yaw"; null removes the mapping */
  source: text().min(1, { message: "source must not be empty" }).max(200).nullable(),
  /** a bond line's support point (0-based, in MODEL.md's corner order) for one of several height columns */
  support: z.number({ message: "support must be a number" }).int({ message: "support must be a whole number" }).min(0).max(63).optional(),
  /** a tilt's component (x, y) or an axis angle (g1..g6) for one of several columns of one source */
  component: z.enum(["x", "y", "g1", "g2", "g3", "g4", "g5", "g6"], { message: "component must be x, y or g1..g6" }).optional(),
  unit: MeasureUnitSchema.optional(),
  nominal: z.number({ message: "nominal must be a number" }).finite({ message: "nominal must be a finite number" }).optional(),
});
export type MappingInput = z.infer<typeof MappingInputSchema>;
export const UpdateMappingsSchema = z.object({
  mappings: z
    .array(MappingInputSchema, { message: "mappings must be a list" })
    .min(1, { message: "give at least one mapping" })
    .max(DATASET_MAX_COLUMNS),
  ...VersionBodySchema.shape,
});
export type UpdateMappings = z.infer<typeof UpdateMappingsSchema>;

/** Fields sent beside the file of an upload. */
export const UploadFieldsSchema = z.object({
  lot: text().trim().max(100, { message: "the lot is limited to 100 characters" }).optional(),
  note: text().trim().max(2000, { message: "the note is limited to 2,000 characters" }).optional(),
});
export type UploadFields = z.infer<typeof UploadFieldsSchema>;

export const UpdateDatasetSchema = z.object({
  /** a label column naming each row's lot (or date); null: the rows have no lots */
  lotColumn: text({ message: "lotColumn must be a column's header or null" }).min(1).nullable(),
  ...VersionBodySchema.shape,
});
export type UpdateDataset = z.infer<typeof UpdateDatasetSchema>;

export const StatisticsQuerySchema = z.object({
  column: text({ message: "name the column: ?column=…" }).min(1, { message: "name the column: ?column=…" }),
});

export const DatasetStatisticsSchema = z.object({
  column: text(),
  /** unit of every number below: the source's unit when mapped, else the column's own (or none) */
  unit: text().nullable(),
  /** `text` says what happened in words: "value − 10 µm nominal, mm → µm (× 1000)" */
  converted: z.object({ from: MeasureUnitSchema, factor: z.number(), nominal: z.number(), text: text() }).nullable(),
  source: text().nullable(),
  part: z.number().int().nullable(),
  partLabel: text().nullable(),
  summary: z.object({
    n: z.number().int(),
    missing: z.number().int(),
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
  normalityNote: text().nullable(),
  tolerance: z
    .object({ dist: text(), tol: z.number().nullable(), sigmas: z.number().nullable(), mean: z.number(), sigma: z.number().nullable() })
    .nullable(),
  capability: z
    .object({
      lsl: z.number(),
      usl: z.number(),
      /** units the figures rest on */
      n: z.number().int(),
      pp: z.number(),
      ppk: z.number(),
      /** within lots when the rows have lots of several units; otherwise equal to pp, ppk */
      cp: z.number(),
      cpk: z.number(),
      basis: z.enum(["within lots", "overall"]),
      sigmaOverall: z.number(),
      sigmaWithin: z.number().nullable(),
      /** one-sided lower confidence bound of cpk at `confidence` (Bissell 1990) */
      cpkLower: z.number(),
      confidence: z.number(),
      expectedPpm: z.number(),
      observedOut: z.number().int(),
      observedPpm: z.number(),
    })
    .nullable(),
  /** the lot column used, and statistics per lot in file order */
  lotColumn: text().nullable(),
  lots: z.array(
    z.object({
      lot: text(),
      n: z.number().int(),
      mean: z.number(),
      std: z.number(),
      min: z.number(),
      max: z.number(),
      ppk: z.number().nullable(),
    }),
  ),
  /** Shewhart individuals and moving-range chart in production (file) order */
  controlChart: z
    .object({
      method: text(),
      constants: z.object({ d2: z.number(), D3: z.number(), D4: z.number(), source: text() }),
      points: z.array(
        z.object({
          order: z.number().int(),
          row: z.number().int(),
          lot: text().nullable(),
          x: z.number(),
          mr: z.number().nullable(),
          outX: z.boolean(),
          outMr: z.boolean(),
        }),
      ),
      x: z.object({ centre: z.number(), lcl: z.number(), ucl: z.number() }),
      mr: z.object({ centre: z.number(), lcl: z.number(), ucl: z.number() }),
      sigmaShortTerm: z.number(),
      signals: z.number().int(),
    })
    .nullable(),
  outliers: z.object({
    rule: text(),
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
  source: text({ message: "source is required" }).min(1, { message: "source is required" }).max(200),
  datasetId: IdSchema,
  /** needed only where the source has one column in the data set; a pooled source takes all of its mapped columns */
  column: text({ message: "column must be a header" }).min(1, { message: "column must not be empty" }).optional(),
  mode: z.enum(["resample", "normal"], { message: 'mode must be "resample" or "normal"' }),
});
export type AsBuiltEntry = z.infer<typeof AsBuiltEntrySchema>;

/** What a study records of each replaced source. */
export const AsBuiltRecordSchema = AsBuiltEntrySchema.extend({
  datasetName: text(),
  /** the columns used, in part order for a pooled source */
  columns: z.array(text()).default([]),
  /** rows left out because a column of the row had a gap */
  dropped: z.number().int().default(0),
  n: z.number().int(),
  /** of the values as drawn, in the source's unit */
  mean: z.number(),
  std: z.number(),
  unit: z.enum(["um", "deg"]),
  /** the design tolerance the data replaced */
  replaced: z.record(text(), z.unknown()),
});
export type AsBuiltRecord = z.infer<typeof AsBuiltRecordSchema>;
