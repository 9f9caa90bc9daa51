/**
 * Units a measurement column may be in, and their conversion to the unit of the tolerance
 * source it replaces. The engine draws heights in um and angles in degrees (MODEL.md §1).
 */
export const MEASURE_UNITS = ["um", "mm", "deg", "mrad", "arcmin"] as const;
export type MeasureUnit = (typeof MEASURE_UNITS)[number];
export type SourceUnit = "um" | "deg";

/** What one unit of each measure is in the engine's unit of the same kind. */
const FACTOR: Record<MeasureUnit, { kind: SourceUnit; toBase: number }> = {
  um: { kind: "um", toBase: 1 },
  mm: { kind: "um", toBase: 1000 },
  deg: { kind: "deg", toBase: 1 },
  mrad: { kind: "deg", toBase: 180 / Math.PI / 1000 },
  arcmin: { kind: "deg", toBase: 1 / 60 },
};

export function unitKind(unit: MeasureUnit): SourceUnit {
  return FACTOR[unit].kind;
}

/** Factor that turns a value in `from` into the source's unit; null when the kinds differ. */
export function conversionFactor(from: MeasureUnit, to: SourceUnit): number | null {
  const f = FACTOR[from];
  return f.kind === to ? f.toBase : null;
}

// Spellings seen in measurement files: micro sign and Greek mu, "°", plurals.
const ALIASES: Record<string, MeasureUnit> = {
  um: "um",
  µm: "um",
  μm: "um",
  micron: "um",
  microns: "um",
  micrometer: "um",
  micrometre: "um",
  mm: "mm",
  deg: "deg",
  degree: "deg",
  degrees: "deg",
  "°": "deg",
  mrad: "mrad",
  milliradian: "mrad",
  arcmin: "arcmin",
  "'": "arcmin",
  "′": "arcmin",
};

export function parseUnit(text: string): MeasureUnit | null {
  return ALIASES[text.trim().toLowerCase()] ?? null;
}

export type ParsedHeader = { name: string; unit: MeasureUnit | null; unitText: string | null; strict: boolean };

/**
 * Splits "tilt_x [deg]" or "tilt_x (deg)" into a name and a unit. Square brackets always mean
 * a unit (an unknown one is an error the caller reports); parentheses are a unit only when
 * they hold a known one, so "Lot (A)" stays a name.
 */
export function parseHeader(header: string): ParsedHeader {
  const h = header.trim();
  const square = /^(.*?)\s*\[([^\]]*)\]\s*$/.exec(h);
  if (square) return { name: square[1].trim() || h, unit: parseUnit(square[2]), unitText: square[2].trim(), strict: true };
  const round = /^(.*?)\s*\(([^)]*)\)\s*$/.exec(h);
  if (round && parseUnit(round[2]))
    return { name: round[1].trim() || h, unit: parseUnit(round[2]), unitText: round[2].trim(), strict: false };
  return { name: h, unit: null, unitText: null, strict: false };
}
