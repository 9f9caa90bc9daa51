/**
 * What-if runs (issue 12): sweeps of one parameter and least-cost tolerance allocations.
 * Requests carry the study file (checked against the revision's stack by the engine's
 * validator, like an ordinary study); answers are what GET /api/sweeps/:id and
 * GET /api/allocations/:id send.
 */
import * as z from "zod";
import { IdSchema } from "./common";
import { SiteSchema } from "./site";
import { StudyStatusSchema } from "./studies";
import type { StudyFile } from "./study-file";
import type { AllocationOptions, AllocationOutcome } from "../whatif/allocation";
import type { Crossing, SweepPoint } from "../whatif/sweep";

export const WHAT_IF_KINDS = ["sweep", "allocation"] as const;
export type WhatIfKind = (typeof WHAT_IF_KINDS)[number];

// ---- what a run stores (what_if_runs.input and .result); its kind says which of the two -------
/** A sweep's checked request: the study file, the parameter and its values in ascending order. */
export type StoredSweepInput = { study: StudyFile; parameter: string; values: number[] };
/** An allocation's checked request: the study file and the free sources, costs and bounds. */
export type StoredAllocationInput = AllocationOptions & { study: StudyFile };
export type WhatIfInput = StoredSweepInput | StoredAllocationInput;
/** A sweep's points so far (stored after each point) and, once finished, its crossings. */
export type SweepOutcome = { points: SweepPoint[]; crossings: Crossing[] };
export type WhatIfResult = SweepOutcome | AllocationOutcome;

/** A sweep may have at most this many values (each one is a whole study). */
export const MAX_SWEEP_VALUES = 25;

const StudyBody = z.record(z.string(), z.unknown(), { message: "study must be a study file (an object)" });
const finite = (what: string) => z.number({ message: `${what} must be a number` }).finite({ message: `${what} must be a finite number` });
const positive = (what: string) => finite(what).positive({ message: `${what} must be greater than 0` });

export const CreateSweepSchema = z.object({
  study: StudyBody,
  parameter: z
    .string({ message: 'parameter is required: a source id ("mag.axis"), "inclinationDeg" or "calibration.residualDeg"' })
    .trim()
    .min(1, { message: "parameter is required" })
    .max(200, { message: "parameter must be at most 200 characters" }),
  values: z
    .array(finite("each value"), { message: "values must be a list of numbers" })
    .min(2, { message: "a sweep needs at least 2 values" })
    .max(MAX_SWEEP_VALUES, { message: `a sweep takes at most ${MAX_SWEEP_VALUES} values` }),
});
export type CreateSweep = z.infer<typeof CreateSweepSchema>;

export const CostModelSchema = z.object({
  a: finite("a").min(0, { message: "a must be 0 or more" }),
  b: positive("b"),
  k: positive("k").max(10, { message: "k must be at most 10" }),
});

export const BoundsSchema = z
  .object({ min: positive("min").optional(), max: positive("max").optional() })
  .refine((b) => b.min === undefined || b.max === undefined || b.min < b.max, { message: "min must be below max", path: ["max"] });

export const CreateAllocationSchema = z.object({
  study: StudyBody,
  free: z
    .array(z.string().trim().min(1, { message: "a source id may not be empty" }), { message: "free must be a list of source ids" })
    .min(1, { message: "free needs at least one source (leave it out to free every source)" })
    .max(200, { message: "free takes at most 200 sources" })
    .optional(),
  costs: z.record(z.string(), CostModelSchema, { message: "costs must map source ids to { a, b, k }" }).optional(),
  bounds: z.record(z.string(), BoundsSchema, { message: "bounds must map source ids to { min, max }" }).optional(),
});
export type CreateAllocation = z.infer<typeof CreateAllocationSchema>;

export const CreatedRunSchema = z.object({ id: IdSchema });

const Interval = z.tuple([z.number(), z.number()]);
const Progress = z.object({ done: z.number().int(), total: z.number().int() });

export const SweepRequirementSchema = z.object({
  metric: z.string(),
  max: z.number(),
  yield: z.number(),
  predictedYield: z.number(),
  ci: Interval,
  passes: z.boolean(),
  /** the metric's percentile at the target yield (null when the engine gave none) */
  limitAtTarget: z.number().nullable(),
});
export const SweepPointSchema = z.object({ value: z.number(), requirements: z.array(SweepRequirementSchema) });

const RunBase = z.object({
  id: IdSchema,
  projectId: IdSchema,
  revisionId: IdSchema,
  revisionNumber: z.number().int(),
  status: StudyStatusSchema,
  progress: Progress,
  error: z.string().nullable(),
  trials: z.number().int(),
  seed: z.number(),
  createdAt: z.string(),
  finishedAt: z.string().nullable(),
});

export const SweepSchema = RunBase.extend({
  parameter: z.string(),
  parameterKind: z.enum(["source", "inclination", "calibration"]),
  unit: z.enum(["um", "deg"]),
  /** today's value of the parameter (the point that equals an ordinary study) */
  current: z.number(),
  values: z.array(z.number()),
  points: z.array(SweepPointSchema),
  crossings: z.array(z.object({ metric: z.string(), max: z.number(), value: z.number().nullable() })),
});
export type Sweep = z.infer<typeof SweepSchema>;
export type SweepPointView = z.infer<typeof SweepPointSchema>;

export const AllocationSourceSchema = z.object({
  source: z.string(),
  unit: z.enum(["um", "deg"]),
  free: z.boolean(),
  current: z.number(),
  proposed: z.number(),
  costCurrent: z.number(),
  costProposed: z.number(),
  cost: z.object({ a: z.number(), b: z.number(), k: z.number() }),
  min: z.number(),
  max: z.number(),
  atBound: z.enum(["min", "max"]).nullable(),
  noInfluence: z.boolean(),
});
export const AllocationRequirementSchema = z.object({
  metric: z.string(),
  max: z.number(),
  yield: z.number(),
  predictedYield: z.number(),
  ci: Interval,
  passes: z.boolean(),
  demonstrated: z.boolean(),
  limitAtTarget: z.number().nullable(),
  current: z.object({ predictedYield: z.number(), ci: Interval, passes: z.boolean(), limitAtTarget: z.number().nullable() }),
});

export const AllocationSchema = RunBase.extend({
  /** null until the run finishes */
  verified: z.boolean().nullable(),
  message: z.string().nullable(),
  method: z.string().nullable(),
  sources: z.array(AllocationSourceSchema),
  requirements: z.array(AllocationRequirementSchema),
  totalCostCurrent: z.number().nullable(),
  totalCostProposed: z.number().nullable(),
  rounds: z.array(
    z.object({ round: z.number(), totalCost: z.number(), demonstrated: z.boolean(), closestShare: z.number(), minLowerMargin: z.number() }),
  ),
  /** the draft revision made from the proposal, once applied */
  appliedRevisionId: IdSchema.nullable(),
});
export type Allocation = z.infer<typeof AllocationSchema>;

/** The inclination of the main field over the globe at a date (for the where-it-holds map). */
export const InclinationGridQuerySchema = z.object({
  date: SiteSchema.shape.date,
  stepDeg: z.coerce
    .number({ message: "stepDeg must be a number" })
    .min(1, { message: "stepDeg must be between 1 and 10" })
    .max(10, { message: "stepDeg must be between 1 and 10" })
    .default(4),
});
export const InclinationGridSchema = z.object({
  model: z.string(),
  date: z.string(),
  stepDeg: z.number(),
  /** cell centres, south to north and west to east */
  latitudes: z.array(z.number()),
  longitudes: z.array(z.number()),
  /** inclination in degrees, [latitude index][longitude index] */
  inclinationDeg: z.array(z.array(z.number())),
});
export type InclinationGrid = z.infer<typeof InclinationGridSchema>;
