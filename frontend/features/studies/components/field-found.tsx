import { WMM_FIRST_DATE, WMM_LAST_DATE } from "@shared/schemas/site";
import { Badge } from "@frontend/components/ui/badge";
import { Spinner } from "@frontend/components/ui/spinner";
import { cn } from "@frontend/lib/cn";
import { formatCount, formatDeg, formatMrad } from "@shared/format";

export interface FoundField {
  model: string;
  inclinationDeg: number;
  declinationDeg: number;
  totalIntensityNt: number;
  horizontalIntensityNt: number;
}

/** The field WMM2025 gives at the typed site, or why there is none yet. */
export function FieldFound({
  state,
  data,
  error,
  stale,
}: {
  state: "incomplete" | "loading" | "found" | "error";
  data?: FoundField;
  error?: string;
  stale: boolean;
}) {
  return (
    <div
      aria-live="polite"
      aria-label="Field at the site"
      className={cn("rounded-md border px-3 py-2", state === "error" ? "border-fail/30 bg-fail/[0.05]" : "border-line bg-paper/70")}
    >
      <div className="mb-1 flex items-center justify-between">
        <span className="text-2xs font-bold tracking-[0.06em] text-ink/50 uppercase">Field found</span>
        {data ? <Badge tone="mag">{data.model}</Badge> : null}
      </div>
      {state === "incomplete" ? (
        <p className="text-xs text-ink/55">
          Enter latitude, longitude and a date between {WMM_FIRST_DATE} and {WMM_LAST_DATE}.
        </p>
      ) : state === "error" ? (
        <p className="text-xs text-fail">{error}</p>
      ) : state === "loading" || !data ? (
        <p className="flex items-center gap-2 text-xs text-ink/55">
          <Spinner /> Looking up the field…
        </p>
      ) : (
        <dl className={cn("grid grid-cols-[1fr_auto] gap-x-3 gap-y-0.5 text-xs", stale && "opacity-60")}>
          <dt className="text-ink/60">Inclination</dt>
          <dd className="num font-bold text-ink">
            <span>{formatDeg(data.inclinationDeg, 5)}</span>{" "}
            <span className="font-normal text-ink/50">({formatMrad(data.inclinationDeg, 4)})</span>
          </dd>
          <dt className="text-ink/60">Declination</dt>
          <dd className="num">{formatDeg(data.declinationDeg, 4)}</dd>
          <dt className="text-ink/60">Total intensity</dt>
          <dd className="num">{formatCount(data.totalIntensityNt)} nT</dd>
          <dt className="text-ink/60">Horizontal</dt>
          <dd className="num">{formatCount(data.horizontalIntensityNt)} nT</dd>
        </dl>
      )}
    </div>
  );
}
