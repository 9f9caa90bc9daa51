import type { ReactNode } from "react";
import type { Dataset, DatasetStatistics } from "@shared/schemas/datasets";
import { Alert } from "@frontend/components/ui/alert";
import { Badge } from "@frontend/components/ui/badge";
import { ChartDownload, ChartFileName } from "@frontend/components/ui/chart-download";
import { Select } from "@frontend/components/ui/field";
import { Spinner } from "@frontend/components/ui/spinner";
import { isApiError } from "@frontend/lib/api-client";
import { useDatasetStatistics } from "../api/get-dataset-statistics";
import { formatCount, formatIndex, formatMeasure, formatMeasureUnit, formatPpm } from "@shared/format";
import { ToleranceWindow } from "./tolerance-window";

/** Production target for Cpk (REFERENCES.md: ≥ 1.33 in production, common practice). */
const CPK_TARGET = 1.33;

/** The statistics of one measured column: capability as a statement, the tolerance window with the units in production order, lots, normality, outliers. */
export function CapabilityView({ dataset, column, onColumn }: { dataset: Dataset; column: string; onColumn: (c: string) => void }) {
  const numeric = dataset.columns.filter((c) => c.kind === "number");
  const stats = useDatasetStatistics(dataset.id, column);
  const s = stats.data;

  return (
    // the chart's files are named after the data set
    <ChartFileName value={dataset.name.replace(/\.(csv|xlsx)$/i, "")}>
      <div className="flex flex-col gap-4 p-4">
        <div className="flex flex-wrap items-center gap-3">
          <label className="flex items-center gap-2 text-xs font-semibold text-ink/75">
            Column
            <Select compact aria-label="Column for capability" value={column} onChange={(e) => onColumn(e.target.value)} className="w-64">
              {numeric.map((c) => (
                <option key={c.key} value={c.key}>
                  {c.key}
                  {c.mapping ? ` → ${c.mapping.source}` : ""}
                </option>
              ))}
            </Select>
          </label>
          {stats.isFetching ? <Spinner className="text-ink/45" /> : null}
          {s?.source ? (
            <span className="text-xs text-ink/65">
              Measures <Badge tone="accel">{s.source}</Badge>
              {s.partLabel ? <span className="ml-1">({s.partLabel})</span> : null}
              {s.converted ? <span className="ml-1.5">{s.converted.text}</span> : null}
            </span>
          ) : s ? (
            <span className="text-xs text-ink/55">Not mapped: map the column to a tolerance source to compare it with the tolerance.</span>
          ) : null}
        </div>

        {stats.isError ? <Alert>{isApiError(stats.error) ? stats.error.message : "The statistics could not be loaded."}</Alert> : null}
        {stats.isPending ? (
          <p className="flex items-center gap-2 text-[13px] text-ink/55">
            <Spinner /> Computing statistics…
          </p>
        ) : null}
        {s ? <StatisticsBody s={s} /> : null}
      </div>
    </ChartFileName>
  );
}

/** The capability and its confidence bound as one statement, in words and numbers. */
export function capabilityStatement(s: DatasetStatistics): string | null {
  const c = s.capability;
  if (!c) return null;
  const u = s.unit;
  const within = c.basis === "within lots";
  const head = `Over ${c.n} units, Cpk ${within ? "within lots" : "over all units"} reads ${formatIndex(c.cpk)}; with ${Math.round(c.confidence * 100)} % confidence the process is at least ${formatIndex(c.cpkLower)}`;
  const ask =
    c.cpkLower >= CPK_TARGET
      ? `, so it holds the usual ${CPK_TARGET}`
      : c.cpk >= CPK_TARGET
        ? `, so ${c.n} units do not yet show the usual ${CPK_TARGET}`
        : `, short of the usual ${CPK_TARGET}`;
  const overall = within ? ` Over all units together Ppk is ${formatIndex(c.ppk)}.` : "";
  const out = ` ${c.observedOut} of ${c.n} units lie outside ${formatMeasureUnit(c.lsl, u)} … ${formatMeasureUnit(c.usl, u)}; the fitted normal expects ${formatPpm(c.expectedPpm)} ppm.`;
  return `${head}${ask}.${overall}${out}`;
}

function StatisticsBody({ s }: { s: DatasetStatistics }) {
  const u = s.unit;
  const c = s.capability;
  const statement = capabilityStatement(s);
  const holds = c ? c.cpkLower >= CPK_TARGET : false;
  return (
    <>
      {statement ? (
        <p
          aria-label="Capability statement"
          className={`rounded-lg border-l-4 bg-panel px-4 py-3 text-[14px] leading-relaxed text-ink ${holds ? "border-pass" : "border-fail"}`}
        >
          {statement}
        </p>
      ) : (
        <p className="text-[13px] text-ink/65">
          {s.tolerance
            ? "The tolerance is measured data itself: there are no limits to hold the units against."
            : "No tolerance to hold the units against: map the column to a source."}
        </p>
      )}
      <div className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_290px]">
        <figure aria-label={`Tolerance window of ${s.column}`} className="relative min-w-0 rounded-lg border border-line bg-white/60 p-2">
          <ToleranceWindow s={s} />
          <ChartDownload
            name={`tolerance-window-${s.column}`}
            title={`Units of ${s.column} in production order inside the tolerance window`}
            className="absolute top-1 right-1"
          />
          <figcaption className="px-2 pt-1 text-2xs text-ink/60">
            The frame is the tolerance window{c ? "" : " (none: the column is not mapped to a ± tolerance)"}. Left: each unit in production
            order
            {s.lotColumn ? `, lots from “${s.lotColumn}”` : ""}, with the individuals chart's centre line and control limits (dashed).
            Right: the same values as a distribution with the fitted normal. Below: moving ranges of consecutive units.{" "}
            {s.controlChart
              ? `Constants d₂ = ${s.controlChart.constants.d2}, D₄ = ${s.controlChart.constants.D4} (${s.controlChart.constants.source}). `
              : ""}
            {s.controlChart
              ? s.controlChart.signals
                ? `${s.controlChart.signals} ${s.controlChart.signals === 1 ? "unit lies" : "units lie"} beyond a control limit: look for a drift or a step.`
                : "No unit beyond a control limit."
              : ""}
          </figcaption>
        </figure>
        <div className="flex flex-col gap-3 text-[13px]">
          <dl className="grid grid-cols-2 gap-px overflow-hidden rounded-lg border border-line bg-line" aria-label="Column statistics">
            <Stat label="Units">
              {formatCount(s.summary.n)}
              {s.summary.missing ? <span className="ml-1 text-xs font-normal text-ink/55">+ {s.summary.missing} gaps</span> : null}
            </Stat>
            <Stat label="Mean">{formatMeasureUnit(s.summary.mean, u)}</Stat>
            <Stat label="Std dev (n − 1)">{formatMeasureUnit(s.summary.std, u)}</Stat>
            <Stat label="Min … max">
              {formatMeasure(s.summary.min)} … {formatMeasureUnit(s.summary.max, u)}
            </Stat>
            <Stat label="Tolerance">
              {s.tolerance && s.tolerance.tol !== null
                ? `${s.tolerance.mean ? `${formatMeasure(s.tolerance.mean)} ` : ""}±${formatMeasureUnit(s.tolerance.tol, u)} ${s.tolerance.dist}`
                : s.tolerance
                  ? "measured data"
                  : "—"}
            </Stat>
            <Stat label={`Cpk ${c?.basis === "within lots" ? "within lots" : ""}`}>{c ? formatIndex(c.cpk) : "—"}</Stat>
            <Stat label="Cpk, 95 % lower">{c ? formatIndex(c.cpkLower) : "—"}</Stat>
            <Stat label="Cp">{c ? formatIndex(c.cp) : "—"}</Stat>
            <Stat label="Ppk over all">{c ? formatIndex(c.ppk) : "—"}</Stat>
            <Stat label="Pp">{c ? formatIndex(c.pp) : "—"}</Stat>
            <Stat label="Out of tolerance">{c ? `${formatPpm(c.expectedPpm)} ppm · ${c.observedOut} of ${c.n}` : "—"}</Stat>
            <Stat label="σ within / overall">
              {c ? `${c.sigmaWithin !== null ? formatMeasure(c.sigmaWithin, 3) : "—"} / ${formatMeasure(c.sigmaOverall, 3)}` : "—"}
            </Stat>
          </dl>
          {c ? (
            <p className="text-2xs text-ink/55">
              Lower bound: Bissell's normal approximation (1990), one-sided {Math.round(c.confidence * 100)} %.{" "}
              {c.basis === "within lots"
                ? "Cp, Cpk use the pooled spread within lots; Pp, Ppk the spread of all units."
                : "Without lots of several units, Cp and Cpk are the overall indices (Pp, Ppk)."}
            </p>
          ) : null}
          <section aria-label="Normality">
            <h3 className="text-2xs font-bold tracking-[0.06em] text-ink/55 uppercase">Normality</h3>
            {s.normality ? (
              <p className="mt-1">
                <Badge tone={s.normality.normalAt5pct ? "pass" : "fail"}>
                  {s.normality.normalAt5pct ? "consistent with normal" : "not normal"}
                </Badge>
                <span className="ml-2 text-ink/70 tabular-nums">
                  A* = {s.normality.a2Star.toFixed(3)}, p = {s.normality.pValue < 0.001 ? "< 0.001" : s.normality.pValue.toFixed(3)}
                </span>
                <span className="mt-1 block text-xs text-ink/55">
                  Anderson–Darling, D'Agostino and Stephens (1986).
                  {s.normality.normalAt5pct
                    ? ""
                    : " The fitted normal, its ppm and the bound are then only a rough guide; the as-built study can resample the measurements instead."}
                </span>
              </p>
            ) : (
              <p className="mt-1 text-xs text-ink/60">{s.normalityNote}</p>
            )}
          </section>
          <section aria-label="Outliers">
            <h3 className="text-2xs font-bold tracking-[0.06em] text-ink/55 uppercase">Outliers</h3>
            {s.outliers.values.length ? (
              <ul className="mt-1 flex flex-col gap-0.5 text-xs">
                {s.outliers.values.slice(0, 8).map((o) => (
                  <li key={o.row} className="tabular-nums">
                    <span className="font-semibold text-fail">Row {o.row}</span>: {formatMeasureUnit(o.value, u)} (M = {o.score.toFixed(1)})
                  </li>
                ))}
                {s.outliers.values.length > 8 ? <li className="text-ink/55">and {s.outliers.values.length - 8} more</li> : null}
              </ul>
            ) : (
              <p className="mt-1 text-xs text-ink/60">None.</p>
            )}
            <p className="mt-1 text-2xs text-ink/50">Rule: {s.outliers.rule}.</p>
          </section>
        </div>
      </div>
      {s.lots.length > 1 ? <LotTable s={s} /> : null}
    </>
  );
}

function LotTable({ s }: { s: DatasetStatistics }) {
  const u = s.unit;
  return (
    <table className="w-full max-w-3xl border-collapse text-[13px]" aria-label="Lots">
      <thead className="border-b border-line text-2xs font-bold tracking-[0.06em] text-ink/55 uppercase">
        <tr>
          <th className="px-2 py-1 text-left">Lot</th>
          <th className="px-2 py-1 text-right">Units</th>
          <th className="px-2 py-1 text-right">Mean</th>
          <th className="px-2 py-1 text-right">Std dev</th>
          <th className="px-2 py-1 text-right">Min … max</th>
          <th className="px-2 py-1 text-right">Ppk of the lot</th>
        </tr>
      </thead>
      <tbody>
        {s.lots.map((l) => (
          <tr key={l.lot} className="border-b border-line/60">
            <td className="px-2 py-1 font-semibold">{l.lot}</td>
            <td className="num px-2 py-1">{l.n}</td>
            <td className="num px-2 py-1">{formatMeasureUnit(l.mean, u)}</td>
            <td className="num px-2 py-1">{l.n > 1 ? formatMeasureUnit(l.std, u) : "—"}</td>
            <td className="num px-2 py-1">
              {formatMeasure(l.min)} … {formatMeasureUnit(l.max, u)}
            </td>
            <td className="num px-2 py-1">{l.ppk !== null ? formatIndex(l.ppk) : "—"}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

function Stat({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div className="bg-panel px-3 py-2">
      <dt className="text-[10px] font-bold tracking-[0.08em] text-ink/45 uppercase">{label}</dt>
      <dd className="mt-0.5 text-[13px] font-semibold whitespace-nowrap text-ink tabular-nums">{children}</dd>
    </div>
  );
}
