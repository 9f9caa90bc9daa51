/**
 * The heading-error envelope of the result file, split by tilt for the small multiples:
 * per heading the 5th–95th percentile band and the median of the error over trials.
 * The first heading is repeated at 360° so each curve closes the turn.
 */
import type { ResultFile } from "@shared/schemas/result-file";

type Envelope = NonNullable<ResultFile["envelope"]>;

export interface EnvelopeRow {
  headingDeg: number;
  band: [number, number];
  p50: number;
  min: number;
  max: number;
}

export interface TiltSeries {
  key: string;
  pitchDeg: number;
  rollDeg: number;
  label: string;
  rows: EnvelopeRow[];
}

const signed = (v: number) => `${v > 0 ? "+" : v < 0 ? "−" : ""}${Math.abs(v)}°`;

export function tiltLabel(pitchDeg: number, rollDeg: number): string {
  if (pitchDeg === 0 && rollDeg === 0) return "Level";
  if (rollDeg === 0) return `Pitch ${signed(pitchDeg)}`;
  if (pitchDeg === 0) return `Roll ${signed(rollDeg)}`;
  return `Pitch ${signed(pitchDeg)}, roll ${signed(rollDeg)}`;
}

export function envelopeByTilt(env: Envelope): TiltSeries[] {
  const out = new Map<string, TiltSeries>();
  for (const p of env.points) {
    const key = `${p.pitchDeg}/${p.rollDeg}`;
    if (!out.has(key)) out.set(key, { key, pitchDeg: p.pitchDeg, rollDeg: p.rollDeg, label: tiltLabel(p.pitchDeg, p.rollDeg), rows: [] });
    out.get(key)!.rows.push({ headingDeg: p.headingDeg, band: [p.p5, p.p95], p50: p.p50, min: p.min, max: p.max });
  }
  for (const s of out.values()) {
    s.rows.sort((a, b) => a.headingDeg - b.headingDeg);
    const first = s.rows[0];
    if (first && first.headingDeg === 0 && s.rows[s.rows.length - 1].headingDeg < 360) s.rows.push({ ...first, headingDeg: 360 });
  }
  return [...out.values()];
}

/** One symmetric y range for every tilt, so the panels compare at a glance. */
export function envelopeExtent(series: TiltSeries[], withExtremes: boolean, limit?: number): number {
  let m = 0;
  for (const s of series)
    for (const r of s.rows)
      m = Math.max(m, Math.abs(r.band[0]), Math.abs(r.band[1]), withExtremes ? Math.max(Math.abs(r.min), Math.abs(r.max)) : 0);
  if (limit !== undefined && Number.isFinite(limit)) m = Math.max(m, limit);
  return niceCeil(m * 1.08 || 1);
}

/** 0.83 → 1, 1.7 → 2, 2.3 → 2.5, 3.4 → 4 … */
export function niceCeil(v: number): number {
  if (!(v > 0)) return 1;
  const e = Math.pow(10, Math.floor(Math.log10(v)));
  for (const f of [1, 1.2, 1.5, 2, 2.5, 3, 4, 5, 6, 8, 10]) if (v <= f * e + 1e-12) return f * e;
  return 10 * e;
}
