/** shared/metrics.ts: every metric id the engine makes has words, a unit and a group. */
import { describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import { metricIds } from "@shared/engine/model";
import { metricInfo, metricUnit, orderedMetrics } from "@shared/metrics";
import { StackFileSchema } from "@shared/schemas/stack-file";

const stack = StackFileSchema.parse(JSON.parse(readFileSync(new URL("../fixtures/stack-reference.json", import.meta.url), "utf8")));

describe("metric words", () => {
  const ids = metricIds(stack, {});

  it("names every id of the reference stack in words, never by the raw id", () => {
    expect(ids.length).toBeGreaterThan(10);
    for (const id of ids) {
      const info = metricInfo(id);
      expect(info.label).not.toBe(id);
      expect(info.shortLabel).not.toBe(id);
      expect(info.label.length).toBeGreaterThan(info.shortLabel.length - 1);
    }
  });

  it("gives cross-axis terms % and angles degrees, as the engine computes them", () => {
    for (const id of ids) expect(metricUnit(id)).toBe(/Pct\./.test(id) ? "%" : "deg");
    expect(metricInfo("mag.crossAxisPct.xy")).toMatchObject({
      unit: "%",
      unitSymbol: "%",
      group: "mag",
      shortLabel: "x←y",
      label: "mag cross-axis x←y",
    });
    expect(metricInfo("accel~mag.relRotDeg")).toMatchObject({
      unit: "deg",
      unitSymbol: "°",
      group: "Relative rotation",
      label: "accel ↔ mag relative rotation",
    });
  });

  it("keeps an unknown id as it is", () => {
    expect(metricInfo("something.else")).toMatchObject({ label: "something.else", unit: "deg" });
  });

  it("orders heading first and keeps every id exactly once", () => {
    const ordered = orderedMetrics(
      ids,
      stack.elements.map((e) => e.id),
    );
    expect(ordered[0]).toBe("heading.maxAbsDeg");
    expect([...ordered].sort()).toEqual([...ids].sort());
  });
});
