/** The map's arithmetic (yield at an inclination, failing latitude bands) and the sweep form's values. */
import { describe, expect, it } from "vitest";
import type { InclinationGrid, SweepPointView } from "@shared/schemas/what-if";
import { failingBands, latitudeText, yieldAt, yieldGrid } from "@frontend/features/what-if/lib/map";
import { evenValues, parseValues } from "@frontend/features/what-if/lib/values";

const point = (value: number, y: number): SweepPointView => ({
  value,
  requirements: [
    {
      metric: "heading.maxAbsDeg",
      max: 2,
      yield: 0.99,
      predictedYield: y,
      ci: [y - 0.001, y + 0.001],
      passes: y >= 0.99,
      limitAtTarget: null,
    },
  ],
});
// yield falls with |inclination|, as a heading error growing with tan(I) makes it
const POINTS = [point(-80, 0.9), point(-40, 0.995), point(0, 1), point(40, 0.995), point(80, 0.9)];

describe("yield at an inclination", () => {
  it("interpolates linearly between the sweep's points and gives null outside them", () => {
    expect(yieldAt(POINTS, 0, 0)).toBe(1);
    expect(yieldAt(POINTS, 0, 60)).toBeCloseTo((0.995 + 0.9) / 2, 12);
    expect(yieldAt(POINTS, 0, -20)).toBeCloseTo(0.9975, 12);
    expect(yieldAt(POINTS, 0, 85)).toBeNull();
    expect(yieldAt([], 0, 10)).toBeNull();
  });
});

describe("failing latitude bands", () => {
  // a toy field: inclination = 2 × latitude (clamped), the same at every longitude
  const lats = [-75, -45, -15, 15, 45, 75];
  const grid: InclinationGrid = {
    model: "test",
    date: "2026-06-01",
    stepDeg: 30,
    latitudes: lats,
    longitudes: [-150, -90, -30, 30, 90, 150],
    inclinationDeg: lats.map((lat) => Array(6).fill(Math.max(-90, Math.min(90, 2 * lat)))),
  };
  it("joins neighbouring failing rows, and counts the cells the sweep does not reach apart", () => {
    const yields = yieldGrid(grid, POINTS, 0);
    // ±75° → |I| 90 (beyond the sweep: unknown), ±45° → 90 too, ±15° → 30: passes (0.99625)
    expect(yields[2][0]).toBeCloseTo(0.99625, 12);
    expect(yields[0][0]).toBeNull();
    expect(failingBands(grid, yields, 0.99)).toEqual([]);
    // a stricter target fails the low latitudes: one band across the equator
    const strict = failingBands(grid, yields, 0.999);
    expect(strict).toEqual([{ fromDeg: -30, toDeg: 30, failingShare: 1, unknownShare: 0 }]);
  });
  it("reports the share of a band that fails", () => {
    const yields = lats.map((lat, i) => grid.longitudes.map((_, j) => (i === 5 && j < 3 ? 0.5 : 1)));
    expect(failingBands(grid, yields, 0.99)).toEqual([{ fromDeg: 60, toDeg: 90, failingShare: 0.5, unknownShare: 0 }]);
    expect(latitudeText(-37.5)).toBe("37.5°S");
    expect(latitudeText(60)).toBe("60°N");
  });
});

describe("sweep values", () => {
  it("reads a typed list and names the entry that is not a number", () => {
    expect(parseValues("0.2, 0.4 ;0.6")).toEqual({ values: [0.2, 0.4, 0.6] });
    expect(parseValues("0.2, x")).toEqual({ error: "“x” is not a number" });
    expect(parseValues("1")).toEqual({ error: "give at least 2 values" });
    expect("error" in parseValues(Array.from({ length: 26 }, (_, i) => i + 1).join(","))).toBe(true);
  });
  it("spaces values evenly, ends included", () => {
    expect(evenValues(-88, 88, 23)).toHaveLength(23);
    expect(evenValues(-88, 88, 23)[11]).toBe(0);
    expect(evenValues(0.15, 1.2, 8)).toEqual([0.15, 0.3, 0.45, 0.6, 0.75, 0.9, 1.05, 1.2]);
  });
});
