/**
 * The study result file (MODEL.md section 11, `"format": "orthostack.result/1"`): what the
 * command-line runner writes and the API returns for a finished study. The engine builds
 * values of this type; the API can parse its responses with it.
 */
import * as z from "zod";

const num = z.number();

export const MetricStatsSchema = z.object({
  /** mean and standard deviation (n − 1) of the signed value */
  mean: num,
  std: num,
  /** percentiles of |value| */
  p50: num,
  p95: num,
  p99: num,
  p9973: num,
  /** largest |value| */
  max: num,
  unit: z.enum(["%", "deg"]),
  /** false: the metric is a magnitude and never negative */
  signed: z.boolean(),
  /** smallest and largest signed value */
  minValue: num,
  maxValue: num,
  /**
   * 95 % coverage intervals of the signed value: probabilistically symmetric, and shortest
   * (JCGM 101 5.3). Optional: results written before engine 1.0.0 lack them.
   */
  interval95: z.tuple([num, num]).optional(),
  shortest95: z.tuple([num, num]).optional(),
});

export const RequirementResultSchema = z.object({
  metric: z.string(),
  max: num,
  yield: num,
  /** fraction of trials with |value| <= max */
  predictedYield: num,
  /** 95 % Wilson score interval on the yield */
  ci: z.tuple([num, num]),
  ppmOut: num,
  /** predicted yield >= target */
  passes: z.boolean(),
  /** the whole interval is at or above the target: the sample demonstrates the yield */
  demonstrated: z.boolean(),
  /** |value| percentile at the yield target: the limit that would just meet it */
  limitAtTarget: num,
});

export const HistogramSchema = z.object({
  /** true: bins of |value| */
  abs: z.boolean(),
  edges: z.array(num),
  counts: z.array(num),
});

export const EnvelopePointSchema = z.object({
  pitchDeg: num,
  rollDeg: num,
  headingDeg: num,
  p5: num,
  p50: num,
  p95: num,
  min: num,
  max: num,
});

export const EnvelopeSchema = z.object({
  inclinationDeg: num,
  accel: z.string(),
  mag: z.string(),
  points: z.array(EnvelopePointSchema),
});

export const ContributorSchema = z.object({
  source: z.string(),
  /** share of the linearised variance (signed metrics) or mean square (magnitudes) */
  linearShare: num,
  linearContribution: num,
  /** share of Σ SRC² from the Monte Carlo regression */
  mcShare: num.nullable(),
  src2: num.nullable(),
});

export const ContributorsSchema = z.object({
  metric: z.string(),
  basis: z.enum(["variance", "meanSquare"]),
  nominal: num,
  linearTotal: num,
  mcDesign: z.enum(["linear", "squared"]).nullable(),
  mcR2: num.nullable(),
  sources: z.array(ContributorSchema),
});

export const StackUpSchema = z.object({
  metric: z.string(),
  nominal: num,
  worstCase: num,
  rss: num,
  linear3Sigma: num,
  mc3Sigma: num,
  mcP9973: num,
});

export const WorstTrialSchema = z.object({ trial: z.number().int(), value: num });

export const ConvergencePointSchema = z.object({
  trials: num,
  mean: num,
  std: num,
  p95: num,
  p99: num,
  p9973: num,
  pAtCoverage: num,
  yield: num.nullable(),
});

export const AdaptiveResultSchema = z.object({
  method: z.literal("JCGM 101:2008 7.9"),
  significantDigits: z.union([z.literal(1), z.literal(2)]),
  M: num,
  runTrials: num,
  runs: num,
  trialsUsed: num,
  maxTrials: num,
  converged: z.boolean(),
  coverage: z.array(z.object({ metric: z.string(), p: num })),
  last: z.array(z.object({ metric: z.string(), delta: num, sMean: num, sStd: num, sQ: num })),
});

export const SourceInfoSchema = z.object({
  id: z.string(),
  unit: z.enum(["um", "deg"]),
  stage: z.string(),
  draws: num,
  sigma: num,
  halfWidth: num,
  mean: num,
  owner: z.string().optional(),
});

export const ResultFileSchema = z.object({
  format: z.literal("orthostack.result/1"),
  engine: z.string(),
  trials: z.number().int(),
  seed: z.number().int(),
  sampling: z.enum(["random", "lhs"]),
  /** how the compass sweep was evaluated; absent in results written before engine 1.1.0 */
  headingEvaluation: z.enum(["screened", "exact"]).optional(),
  stopped: z.boolean(),
  calibration: z.enum(["none", "package", "board"]),
  metrics: z.record(z.string(), MetricStatsSchema),
  requirements: z.array(RequirementResultSchema),
  ciMethod: z.literal("wilson"),
  percentileStore: z.object({ method: z.string(), maxRelativeBucketWidth: num }),
  histograms: z.record(z.string(), HistogramSchema),
  envelope: EnvelopeSchema.nullable(),
  contributors: z.array(ContributorsSchema),
  stackUp: z.array(StackUpSchema),
  worstTrials: z.record(z.string(), z.array(WorstTrialSchema)),
  convergence: z.array(z.object({ metric: z.string(), p: num, points: z.array(ConvergencePointSchema) })),
  adaptive: AdaptiveResultSchema.nullable(),
  sources: z.array(SourceInfoSchema),
});

export type ResultFile = z.infer<typeof ResultFileSchema>;
export type MetricStats = z.infer<typeof MetricStatsSchema>;
export type RequirementResult = z.infer<typeof RequirementResultSchema>;
