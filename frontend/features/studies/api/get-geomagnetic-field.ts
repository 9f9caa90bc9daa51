import { keepPreviousData, queryOptions, useQuery } from "@tanstack/react-query";
import { FieldAtSiteSchema, type FieldAtSite, type Site } from "@shared/schemas/site";
import { api, withQuery } from "@frontend/lib/api-client";
import { studyKeys } from "./keys";

export function getGeomagneticField(site: Site, signal?: AbortSignal): Promise<FieldAtSite> {
  const params = {
    latitudeDeg: String(site.latitudeDeg),
    longitudeDeg: String(site.longitudeDeg),
    altitudeKm: String(site.altitudeKm),
    date: site.date,
  };
  return api.get(withQuery("/api/geomagnetic-field", params), FieldAtSiteSchema, signal);
}

export const geomagneticFieldQueryOptions = (site: Site) =>
  queryOptions({
    queryKey: studyKeys.field(site),
    queryFn: ({ signal }) => getGeomagneticField(site, signal),
    // The model is fixed: the same site and date always give the same field.
    staleTime: Infinity,
  });

/** The WMM2025 field at a site; null while the site is incomplete. */
export function useGeomagneticField(site: Site | null) {
  return useQuery({
    ...geomagneticFieldQueryOptions(site ?? { latitudeDeg: 0, longitudeDeg: 0, altitudeKm: 0, date: "" }),
    enabled: site !== null,
    placeholderData: keepPreviousData,
  });
}
