/** shared/format.ts: the one number and unit formatting of every screen and report file. */
import { describe, expect, it } from "vitest";
import {
  formatBytes,
  formatCount,
  formatDeg,
  formatFraction,
  formatIndex,
  formatMeasure,
  formatMeasureUnit,
  formatMrad,
  formatNumber,
  formatNumberUnit,
  formatPct,
  formatPlain,
  formatPpm,
  formatShare,
  formatValue,
  formatWritten,
  formatYield,
  formatYieldRange,
  unitText,
} from "@shared/format";

describe("significant figures", () => {
  it("keeps three figures at every size, groups thousands, never prints a tail", () => {
    expect(formatNumber(0.075)).toBe("0.0750");
    expect(formatNumber(1.2549)).toBe("1.25");
    expect(formatNumber(-12.349)).toBe("-12.3");
    expect(formatNumber(1250.4)).toBe("1,250");
    expect(formatNumber(0)).toBe("0");
    expect(formatNumber(0.1 + 0.2)).toBe("0.300");
    expect(formatNumber(1e-9)).toBe("0.000000");
    expect(formatNumber(2.5, 2)).toBe("2.5");
  });

  it("writes a dash for what is no number", () => {
    for (const v of [NaN, Infinity, null, undefined]) expect(formatNumber(v)).toBe("—");
    expect(formatDeg(null)).toBe("—");
    expect(formatNumberUnit(undefined, "um")).toBe("—");
    expect(formatShare(NaN)).toBe("—");
    expect(formatYield(null)).toBe("—");
    expect(formatPpm(undefined)).toBe("—");
  });

  it("writes what the engineer typed without floating-point tails", () => {
    expect(formatPlain(0.1 + 0.2)).toBe("0.3");
    expect(formatWritten(12, "um", "±")).toBe("±12 µm");
    expect(formatWritten(0.3, "deg", "+")).toBe("+0.3°");
  });
});

describe("units", () => {
  it("puts degrees on the number and other units after a space", () => {
    expect(unitText("um")).toBe("µm");
    expect(unitText("deg")).toBe("°");
    expect(unitText("%")).toBe("%");
    expect(unitText("furlong")).toBe("furlong");
    expect(unitText(null)).toBe("");
    expect(formatNumberUnit(1.254, "um")).toBe("1.25 µm");
    expect(formatNumberUnit(0.075, "deg")).toBe("0.0750°");
    expect(formatDeg(0.512)).toBe("0.512°");
    expect(formatPct(1.834)).toBe("1.83 %");
  });

  it("shows milliradians beside degrees: 1° is 17.45 mrad", () => {
    expect(formatMrad(1)).toBe("17.5 mrad");
    expect(formatValue(0.0573, "deg")).toBe("0.0573° (1.00 mrad)");
    expect(formatValue(1.75, "%")).toBe("1.75 %");
  });

  it("writes measured values with four figures and a true minus", () => {
    expect(formatMeasure(0.056006)).toBe("0.05601");
    expect(formatMeasure(-1.3)).toBe("−1.3");
    expect(formatMeasure(2.5e-7)).toBe("2.500e-7");
    expect(formatMeasureUnit(10.38, "um")).toBe("10.38 µm");
  });
});

describe("percentages, shares and yields", () => {
  it("writes a small share as '< 0.1 %', never as zero", () => {
    expect(formatShare(0.0004)).toBe("< 0.1 %");
    expect(formatShare(0.0005)).toBe("0.1 %");
    expect(formatShare(0.035)).toBe("3.5 %");
    expect(formatShare(0.42)).toBe("42 %");
    expect(formatShare(0)).toBe("0 %");
    expect(formatShare(1)).toBe("100 %");
  });

  it("gives a yield enough decimals that what is out shows two figures", () => {
    expect(formatYield(0.9973)).toBe("99.73 %");
    expect(formatYield(0.999912)).toBe("99.9912 %");
    expect(formatYield(1)).toBe("100.00 %");
    expect(formatYield(0.5)).toBe("50.00 %");
    expect(formatYieldRange(0.998757, 0.999047)).toBe("99.876 – 99.905 %");
    expect(formatFraction(0.4567)).toBe("45.67 %");
  });

  it("writes parts per million with two figures under 100", () => {
    expect(formatPpm(79060.2)).toBe("79,060 ppm");
    expect(formatPpm(63.4)).toBe("63 ppm");
    expect(formatPpm(2.54)).toBe("2.5 ppm");
    expect(formatPpm(0.004)).toBe("< 0.01 ppm");
    expect(formatPpm(0)).toBe("0 ppm");
    expect(formatPpm(-3)).toBe("0 ppm");
  });

  it("writes counts, capability indices and sizes", () => {
    expect(formatCount(200000)).toBe("200,000");
    expect(formatCount(NaN)).toBe("—");
    expect(formatIndex(1.3333)).toBe("1.33");
    expect(formatBytes(512)).toBe("512 B");
    expect(formatBytes(3500)).toBe("3.4 kB");
    expect(formatBytes(50 * 1024)).toBe("50 kB");
    expect(formatBytes(1.5 * 1048576)).toBe("1.5 MB");
  });
});
