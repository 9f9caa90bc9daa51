import * as z from "zod";
import { isoDate, queryNumber } from "./common";

/** The WMM2025 is valid 2025.0–2030.0; the npm package refuses dates after late 2029. */
export const WMM_FIRST_DATE = "2025-01-01";
export const WMM_LAST_DATE = "2029-11-12";

/** Where and when the product is used, to find the field inclination with the World Magnetic Model. */
export const SiteSchema = z.object({
  latitudeDeg: queryNumber("latitude", (n) =>
    n.min(-90, { message: "latitude must be between -90 and 90°" }).max(90, { message: "latitude must be between -90 and 90°" }),
  ),
  longitudeDeg: queryNumber("longitude", (n) =>
    n.min(-180, { message: "longitude must be between -180 and 360°" }).max(360, { message: "longitude must be between -180 and 360°" }),
  ),
  altitudeKm: queryNumber("altitude", (n) =>
    n
      .min(-1, { message: "altitude must be between -1 and 850 km above the ellipsoid" })
      .max(850, { message: "altitude must be between -1 and 850 km above the ellipsoid" }),
  ).default(0),
  date: isoDate().refine((d) => d >= WMM_FIRST_DATE && d <= WMM_LAST_DATE, {
    message: `the World Magnetic Model 2025 covers ${WMM_FIRST_DATE} to ${WMM_LAST_DATE}`,
  }),
});
export type Site = z.infer<typeof SiteSchema>;

export const FieldAtSiteSchema = z.object({
  site: SiteSchema,
  model: z.string(),
  inclinationDeg: z.number(),
  declinationDeg: z.number(),
  totalIntensityNt: z.number(),
  horizontalIntensityNt: z.number(),
});
export type FieldAtSite = z.infer<typeof FieldAtSiteSchema>;
