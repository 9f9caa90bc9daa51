/**
 * Where the compass holds: an inclination sweep's yields carried onto the globe through the
 * field's inclination at each place (WMM grid from the server), and the latitude bands that fail.
 */
import type { InclinationGrid, SweepPointView } from "@shared/schemas/what-if";

/** Requirement k's predicted yield at an inclination, linear between the sweep's points; null outside them. */
export function yieldAt(points: SweepPointView[], k: number, inclinationDeg: number, clamp = false): number | null {
  if (points.length === 0) return null;
  const first = points[0],
    last = points[points.length - 1];
  if (clamp) inclinationDeg = Math.min(last.value, Math.max(first.value, inclinationDeg));
  if (inclinationDeg < first.value || inclinationDeg > last.value) return null;
  for (let i = 0; i + 1 < points.length; i++) {
    const a = points[i],
      b = points[i + 1];
    if (inclinationDeg <= b.value) {
      const t = b.value === a.value ? 0 : (inclinationDeg - a.value) / (b.value - a.value);
      return a.requirements[k].predictedYield + t * (b.requirements[k].predictedYield - a.requirements[k].predictedYield);
    }
  }
  return last.requirements[k].predictedYield;
}

/**
 * The yield of requirement k at each cell of the grid ([latitude][longitude]); null where the
 * sweep does not reach, or (clamp) the yield of the sweep's nearest end there, which only the
 * boundary line uses, so it follows the yield and not the edge of the sweep's range.
 */
export function yieldGrid(grid: InclinationGrid, points: SweepPointView[], k: number, clamp = false): (number | null)[][] {
  return grid.inclinationDeg.map((row) => row.map((incl) => yieldAt(points, k, incl, clamp)));
}

export type Band = { fromDeg: number; toDeg: number; failingShare: number; unknownShare: number };

/**
 * Latitude bands where the requirement fails somewhere: neighbouring grid rows with a failing
 * cell joined into one band, with the share of its cells that fail (and that the sweep does not reach).
 */
export function failingBands(grid: InclinationGrid, yields: (number | null)[][], target: number): Band[] {
  const half = grid.stepDeg / 2;
  const bands: Band[] = [];
  let open: { from: number; to: number; fail: number; unknown: number; cells: number } | null = null;
  grid.latitudes.forEach((lat, i) => {
    const row = yields[i];
    const fail = row.filter((y) => y !== null && y < target).length;
    const unknown = row.filter((y) => y === null).length;
    if (fail > 0) {
      if (!open) open = { from: lat - half, to: lat + half, fail: 0, unknown: 0, cells: 0 };
      open.to = lat + half;
      open.fail += fail;
      open.unknown += unknown;
      open.cells += row.length;
    } else if (open) {
      bands.push(close(open));
      open = null;
    }
  });
  if (open) bands.push(close(open));
  return bands;
}

function close(b: { from: number; to: number; fail: number; unknown: number; cells: number }): Band {
  const r = (v: number) => Math.round(v * 10) / 10;
  return { fromDeg: r(b.from), toDeg: r(b.to), failingShare: b.fail / b.cells, unknownShare: b.unknown / b.cells };
}

/** "35°S" / "60°N" / "0°". */
export function latitudeText(deg: number): string {
  const v = Math.round(Math.abs(deg) * 10) / 10;
  return deg === 0 ? "0°" : `${v}°${deg < 0 ? "S" : "N"}`;
}
