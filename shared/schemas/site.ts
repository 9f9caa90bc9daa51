import { z } from "zod";

/** The WMM2025 is valid 2025.0–2030.0; the npm package refuses dates after late 2029. */
export const WMM_FIRST_DATE = "2025-01-01";
export const WMM_LAST_DATE = "2029-11-12";

/** Where and when the product is used, to find the field inclination with the World Magnetic Model. */
export const SiteSchema = z.object({
  latitudeDeg: z.coerce
    .number({ message: "latitude must be a number" })
    .min(-90, { message: "latitude must be between -90 and 90°" })
    .max(90, { message: "latitude must be between -90 and 90°" }),
  longitudeDeg: z.coerce
    .number({ message: "longitude must be a number" })
    .min(-180, { message: "longitude must be between -180 and 360°" })
    .max(360, { message: "longitude must be between -180 and 360°" }),
  altitudeKm: z.coerce
    .number({ message: "altitude must be a number" })
    .min(-1, { message: "altitude must be between -1 and 850 km above the ellipsoid" })
    .max(850, { message: "altitude must be between -1 and 850 km above the ellipsoid" })
    .default(0),
  date: z
    .string({ message: "date is required (YYYY-MM-DD)" })
    .regex(/^\d{4}-\d{2}-\d{2}$/, { message: "date must be written YYYY-MM-DD" })
    .refine((d) => !Number.isNaN(Date.parse(`${d}T00:00:00Z`)), { message: "date is not a real calendar date" })
    .refine((d) => d >= WMM_FIRST_DATE && d <= WMM_LAST_DATE, {
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
