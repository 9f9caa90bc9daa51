/**
 * Two studies side by side: which settings differ, how each requirement moved, how the key
 * percentiles moved, and which tolerances differ between their stacks. Every metric is an
 * error magnitude, so lower is better throughout.
 */
import type { ResultFile } from "@shared/schemas/result-file";
import type { StudyFile } from "@shared/schemas/study-file";
import type { FieldAtSite } from "@shared/schemas/site";
import { tiltLabel } from "./envelope";
import { formatCount, formatDeg, formatNumber } from "@shared/format";

export interface SettingRow {
  label: string;
  a: string;
  b: string;
  differs: boolean;
}

type Side = { study: StudyFile; site: FieldAtSite | null; revisionNumber: number; trialsUsed?: number };

function calibrationText(s: StudyFile): string {
  const c = s.calibration;
  if (!c || c.after === "none") return "none";
  const r = c.residualDeg;
  return `after ${c.after}${r && r.tol !== undefined ? `, ${r.dist} ± ${formatNumber(r.tol)}°${r.sigmas !== undefined ? ` (${r.sigmas}σ)` : ""}` : ""}`;
}

export function settingRows(a: Side, b: Side): SettingRow[] {
  const row = (label: string, f: (s: Side) => string): SettingRow => {
    const va = f(a),
      vb = f(b);
    return { label, a: va, b: vb, differs: va !== vb };
  };
  const tilts = (s: StudyFile) =>
    (
      s.tilts ?? [
        { pitchDeg: 0, rollDeg: 0 },
        { pitchDeg: 30, rollDeg: 0 },
        { pitchDeg: -30, rollDeg: 0 },
        { pitchDeg: 0, rollDeg: 30 },
        { pitchDeg: 0, rollDeg: -30 },
      ]
    )
      .map((t) => tiltLabel(t.pitchDeg, t.rollDeg).toLowerCase())
      .join(", ");
  return [
    row("Stack revision", (s) => String(s.revisionNumber)),
    row("Trials", (s) =>
      s.trialsUsed !== undefined && s.trialsUsed !== s.study.trials
        ? `${formatCount(s.trialsUsed)} of ${formatCount(s.study.trials)}`
        : formatCount(s.study.trials),
    ),
    row("Seed", (s) => String(s.study.seed)),
    row("Sampling", (s) => `${s.study.sampling === "lhs" ? "Latin hypercube" : "random"}${s.study.adaptive ? ", adaptive" : ""}`),
    row("Field dip", (s) => formatDeg(s.study.inclinationDeg, 5)),
    // The site enters a study only through its dip (declination cancels, MODEL.md §6): a site
    // against a typed-in dip of the same value, or two sites of one dip, is no difference.
    {
      ...row("Site", (s) => (s.site ? `${s.site.site.latitudeDeg}°, ${s.site.site.longitudeDeg}°, ${s.site.site.date}` : "typed in")),
      ...(a.study.inclinationDeg === b.study.inclinationDeg ? { differs: false } : {}),
    },
    row("Heading step", (s) => `${formatNumber(s.study.headingStepDeg ?? 10)}°`),
    row("Tilts", (s) => tilts(s.study)),
    row("Calibration", (s) => calibrationText(s.study)),
  ];
}

export interface RequirementComparison {
  metric: string;
  max: number;
  target: number;
  a: ResultFile["requirements"][number] | null;
  b: ResultFile["requirements"][number] | null;
  /** B − A, percentage points of yield */
  deltaPoints: number | null;
  /** the two 95 % intervals do not overlap: the change is beyond sampling error */
  significant: boolean;
  verdictChanged: boolean;
}

export function requirementComparison(a: ResultFile, b: ResultFile): RequirementComparison[] {
  const metrics = [...new Set([...a.requirements.map((r) => r.metric), ...b.requirements.map((r) => r.metric)])];
  return metrics.map((metric) => {
    const ra = a.requirements.find((r) => r.metric === metric) ?? null;
    const rb = b.requirements.find((r) => r.metric === metric) ?? null;
    const deltaPoints = ra && rb ? 100 * (rb.predictedYield - ra.predictedYield) : null;
    const significant = !!(ra && rb && (rb.ci[0] > ra.ci[1] || ra.ci[0] > rb.ci[1]));
    return {
      metric,
      max: (ra ?? rb)!.max,
      target: (ra ?? rb)!.yield,
      a: ra,
      b: rb,
      deltaPoints,
      significant,
      verdictChanged: !!(ra && rb && ra.passes !== rb.passes),
    };
  });
}

/** Relative change B vs A in % (null when A is 0 or either is missing). */
export function relativeChange(a: number | undefined, b: number | undefined): number | null {
  if (a === undefined || b === undefined || !Number.isFinite(a) || !Number.isFinite(b) || a === 0) return null;
  return (100 * (b - a)) / Math.abs(a);
}

/** A change worth pointing out: at least this many % of the A value. */
export const NOTABLE_CHANGE_PCT = 5;

export type ChangeTone = "better" | "worse" | "same";

/** Lower is better for every metric (they are all error magnitudes). */
export function changeTone(rel: number | null, threshold = NOTABLE_CHANGE_PCT): ChangeTone {
  if (rel === null || Math.abs(rel) < threshold) return "same";
  return rel < 0 ? "better" : "worse";
}

export interface SourceChange {
  id: string;
  unit: "um" | "deg";
  a: ResultFile["sources"][number] | null;
  b: ResultFile["sources"][number] | null;
}

/** The tolerance sources whose spread, mean or stage differ between the two stacks (or exist in one only). */
export function sourceChanges(a: ResultFile, b: ResultFile): SourceChange[] {
  const ma = new Map(a.sources.map((s) => [s.id, s] as const));
  const mb = new Map(b.sources.map((s) => [s.id, s] as const));
  const ids = [...new Set([...ma.keys(), ...mb.keys()])];
  const same = (x: number, y: number) => Math.abs(x - y) <= 1e-12 * Math.max(1, Math.abs(x), Math.abs(y));
  return ids
    .map((id) => ({ id, unit: (ma.get(id) ?? mb.get(id))!.unit, a: ma.get(id) ?? null, b: mb.get(id) ?? null }))
    .filter(
      ({ a: x, b: y }) =>
        !x ||
        !y ||
        !same(x.sigma, y.sigma) ||
        !same(x.halfWidth, y.halfWidth) ||
        !same(x.mean, y.mean) ||
        x.stage !== y.stage ||
        x.draws !== y.draws,
    );
}
