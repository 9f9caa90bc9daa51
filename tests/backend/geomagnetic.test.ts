import { describe, expect, it } from "vitest";
import { fieldAtSite, fromDecimalYear } from "@backend/services/geomagnetic";
import { SiteSchema } from "@shared/schemas/site";

// Source: WMM2025 official test-value table (NOAA NCEI / BGS), as copied in REFERENCES.md;
// heights above the WGS-84 ellipsoid. The table gives I and D to 0.01 deg and F to 0.1 nT.
const WMM2025_TEST_VALUES = [
  { year: 2025.0, h: 0, lat: 80, lon: 0, I: 83.21, D: 1.28, F: 55178.4 },
  { year: 2025.0, h: 0, lat: 0, lon: 120, I: -14.93, D: -0.16, F: 41064.3 },
  { year: 2025.0, h: 0, lat: -80, lon: 240, I: -72.0, D: 68.78, F: 54698.1 },
  { year: 2027.5, h: 0, lat: 80, lon: 0, I: 83.24, D: 2.59, F: 55253.9 },
  { year: 2027.5, h: 100, lat: 0, lon: 120, I: -14.81, D: -0.23, F: 39007.4 },
  { year: 2027.5, h: 100, lat: -80, lon: 240, I: -72.1, D: 67.93, F: 51825.7 },
];

describe("field inclination from a site (WMM2025)", () => {
  for (const v of WMM2025_TEST_VALUES) {
    it(`${v.year} h=${v.h} km lat=${v.lat} lon=${v.lon}: I ${v.I}°, D ${v.D}°, F ${v.F} nT`, () => {
      const f = fieldAtSite({ latitudeDeg: v.lat, longitudeDeg: v.lon, altitudeKm: v.h, date: "2025-01-01" }, fromDecimalYear(v.year));
      // angles: half a unit of the table's last digit (plus float slack); F: one unit of its
      // last digit (0.1 nT), since the package's coefficients round differently at the poles
      expect(Math.abs(f.inclinationDeg - v.I)).toBeLessThanOrEqual(0.0051);
      expect(Math.abs(f.declinationDeg - v.D)).toBeLessThanOrEqual(0.0051);
      expect(Math.abs(f.totalIntensityNt - v.F)).toBeLessThanOrEqual(0.1);
    });
  }

  it("refuses a site outside the model's range with a message naming the field", () => {
    const r = SiteSchema.safeParse({ latitudeDeg: 95, longitudeDeg: 0, date: "2031-01-01" });
    expect(r.success).toBe(false);
    const paths = r.error!.issues.map((i) => i.path.join("."));
    expect(paths).toEqual(expect.arrayContaining(["latitudeDeg", "date"]));
  });
});
