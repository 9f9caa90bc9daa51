import geomagnetism from "geomagnetism";
import type { FieldAtSite, Site } from "@shared/schemas/site";
import type { InclinationGrid } from "@shared/schemas/what-if";

/**
 * The main field at a site from the World Magnetic Model 2025 (npm `geomagnetism`, which
 * takes the height above the WGS-84 ellipsoid in km). The date may be a decimal year for tests.
 */
export function fieldAtSite(site: Site, at?: Date): FieldAtSite {
  const date = at ?? new Date(`${site.date}T00:00:00Z`);
  const model = geomagnetism.model(date);
  const p = model.point([site.latitudeDeg, site.longitudeDeg, site.altitudeKm]);
  return {
    site,
    model: model.name,
    inclinationDeg: p.incl,
    declinationDeg: p.decl,
    totalIntensityNt: p.f,
    horizontalIntensityNt: p.h,
  };
}

/** A decimal year (2027.5) as a UTC date, the way the WMM test values are given. */
export function fromDecimalYear(y: number): Date {
  const year = Math.floor(y);
  const start = Date.UTC(year, 0, 1);
  const end = Date.UTC(year + 1, 0, 1);
  return new Date(start + (y - year) * (end - start));
}

/** The inclination over the globe at a date, at cell centres `stepDeg` apart (the where-it-holds map). */
export function inclinationGrid(date: string, stepDeg: number): InclinationGrid {
  const model = geomagnetism.model(new Date(`${date}T00:00:00Z`));
  const centres = (from: number, to: number) => {
    const n = Math.round((to - from) / stepDeg);
    return Array.from({ length: n }, (_, i) => from + (i + 0.5) * ((to - from) / n));
  };
  const latitudes = centres(-90, 90);
  const longitudes = centres(-180, 180);
  const inclinationDeg = latitudes.map((lat) => longitudes.map((lon) => Math.round(model.point([lat, lon, 0]).incl * 100) / 100));
  return { model: model.name, date, stepDeg, latitudes, longitudes, inclinationDeg };
}
