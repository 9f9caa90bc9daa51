import type { ReactNode } from "react";
import { CartesianGrid, ComposedChart, Line, ReferenceArea, ReferenceLine, Scatter, XAxis, YAxis } from "recharts";
import type { Dataset, DatasetStatistics } from "@shared/schemas/datasets";
import { Alert } from "@frontend/components/ui/alert";
import { Badge } from "@frontend/components/ui/badge";
import { Select } from "@frontend/components/ui/field";
import { Spinner } from "@frontend/components/ui/spinner";
import { axisLine, axisTick, FAIL, gridProps, INK, PASS } from "@frontend/features/studies";
import { isApiError } from "@frontend/lib/api-client";
import { useDatasetStatistics } from "../api/get-dataset-statistics";
import { niceTicks } from "@frontend/features/datasets/lib/ticks";
import { formatCount, formatIndex, formatMeasure, formatMeasureUnit, formatPpm, unitText } from "@shared/format";

/** Production target for Cpk (REFERENCES.md: ≥ 1.33 in production, common practice). */
const CPK_TARGET = 1.33;
const BAR = "#0d9488";

/** The statistics of one measured column: summary, normality, capability against its tolerance, histogram, outliers. */
export function CapabilityView({ dataset, column, onColumn }: { dataset: Dataset; column: string; onColumn: (c: string) => void }) {
  const numeric = dataset.columns.filter((c) => c.kind === "number");
  const stats = useDatasetStatistics(dataset.id, column);
  const s = stats.data;

  return (
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
            {s.converted ? (
              <span className="ml-1.5">
                converted from {unitText(s.converted.from)} to {unitText(s.unit)}
                {s.converted.nominal ? `, less the nominal ${formatMeasure(s.converted.nominal)} ${unitText(s.converted.from)}` : ""}
              </span>
            ) : null}
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
  );
}

function StatisticsBody({ s }: { s: DatasetStatistics }) {
  const u = s.unit;
  const c = s.capability;
  const cpkTone = !c ? "neutral" : c.cpk >= CPK_TARGET ? "pass" : "fail";
  return (
    <>
      <dl className="grid grid-cols-2 gap-px overflow-hidden rounded-lg border border-line bg-line sm:grid-cols-4 lg:grid-cols-8" aria-label="Column statistics">
        <Stat label="n">{formatCount(s.summary.n)}</Stat>
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
        <Stat label="Cp">{c ? formatIndex(c.cp) : "—"}</Stat>
        <Stat label="Cpk">
          {c ? (
            <span className="inline-flex items-center gap-1.5">
              {formatIndex(c.cpk)}
              <Badge tone={cpkTone}>{c.cpk >= CPK_TARGET ? `≥ ${CPK_TARGET}` : `< ${CPK_TARGET}`}</Badge>
            </span>
          ) : (
            "—"
          )}
        </Stat>
        <Stat label="Out of tolerance">
          {c ? (
            <span title="Expected from the fitted normal; measured units outside the limits">
              {formatPpm(c.expectedPpm)} · {c.observedOut} of {s.summary.n}
            </span>
          ) : (
            "—"
          )}
        </Stat>
      </dl>

      <div className="grid gap-4 lg:grid-cols-[minmax(0,1fr)_300px]">
        <figure aria-label={`Histogram of ${s.column}`} data-chart="capability-histogram" className="min-w-0 rounded-lg border border-line bg-white/60 p-2">
          <Histogram s={s} />
          <figcaption className="flex flex-wrap gap-x-4 gap-y-1 px-2 pt-1 text-2xs text-ink/60">
            <Legend swatch={<span className="inline-block size-2.5 rounded-sm" style={{ background: BAR, opacity: 0.55 }} />}>measured units per bin</Legend>
            <Legend swatch={<span className="inline-block h-0.5 w-4" style={{ background: INK }} />}>fitted normal</Legend>
            {c ? <Legend swatch={<span className="inline-block h-3 w-0 border-l-2 border-dashed" style={{ borderColor: FAIL }} />}>tolerance limits LSL, USL</Legend> : null}
            {s.tolerance ? <Legend swatch={<span className="inline-block h-3 w-0 border-l-2 border-dotted" style={{ borderColor: PASS }} />}>target (the tolerance's mean)</Legend> : null}
            {s.outliers.values.length ? <Legend swatch={<span className="inline-block size-2 rounded-full" style={{ background: FAIL }} />}>outliers</Legend> : null}
          </figcaption>
        </figure>
        <div className="flex flex-col gap-3 text-[13px]">
          <section aria-label="Normality">
            <h3 className="text-2xs font-bold tracking-[0.06em] text-ink/55 uppercase">Normality</h3>
            {s.normality ? (
              <p className="mt-1">
                <Badge tone={s.normality.normalAt5pct ? "pass" : "fail"}>{s.normality.normalAt5pct ? "consistent with normal" : "not normal"}</Badge>
                <span className="ml-2 text-ink/70 tabular-nums">
                  A* = {s.normality.a2Star.toFixed(3)}, p = {s.normality.pValue < 0.001 ? "< 0.001" : s.normality.pValue.toFixed(3)}
                </span>
                <span className="mt-1 block text-xs text-ink/55">
                  Anderson–Darling with mean and σ from the sample, small-sample modified statistic and p-value of D'Agostino and Stephens (1986).
                  {s.normality.normalAt5pct ? "" : " The fitted normal and its ppm are then only a rough guide; the as-built study can resample the measurements instead."}
                </span>
              </p>
            ) : (
              <p className="mt-1 text-xs text-ink/60">{s.normalityNote}</p>
            )}
          </section>
          {c ? (
            <section aria-label="Capability">
              <h3 className="text-2xs font-bold tracking-[0.06em] text-ink/55 uppercase">Capability</h3>
              <p className="mt-1 text-xs text-ink/65">
                LSL {formatMeasureUnit(c.lsl, u)}, USL {formatMeasureUnit(c.usl, u)}. σ is the spread of all {s.summary.n} units together (a first build has no
                subgroups), so Cp and Cpk here are the overall indices (Pp, Ppk). Production asks Cpk ≥ {CPK_TARGET} (common practice).
              </p>
            </section>
          ) : null}
          <section aria-label="Outliers">
            <h3 className="text-2xs font-bold tracking-[0.06em] text-ink/55 uppercase">Outliers</h3>
            {s.outliers.values.length ? (
              <ul className="mt-1 flex flex-col gap-0.5 text-xs">
                {s.outliers.values.slice(0, 12).map((o) => (
                  <li key={o.row} className="tabular-nums">
                    <span className="font-semibold text-fail">Row {o.row}</span>: {formatMeasureUnit(o.value, u)} (M = {o.score.toFixed(1)})
                  </li>
                ))}
                {s.outliers.values.length > 12 ? <li className="text-ink/55">and {s.outliers.values.length - 12} more</li> : null}
              </ul>
            ) : (
              <p className="mt-1 text-xs text-ink/60">None.</p>
            )}
            <p className="mt-1 text-2xs text-ink/50">Rule: {s.outliers.rule}.</p>
          </section>
        </div>
      </div>
    </>
  );
}

function Histogram({ s }: { s: DatasetStatistics }) {
  const h = s.histogram;
  const yTicks = niceTicks(0, Math.max(1, ...h.bins.map((b) => b.count), ...h.curve.map((p) => p.y)) * 1.08, 5).filter((v) => Number.isInteger(v));
  const top = Math.max(yTicks[yTicks.length - 1], Math.max(...h.bins.map((b) => b.count)) * 1.08);
  const c = s.capability;
  const unit = unitText(s.unit);
  const tick = (v: number) => `${formatMeasure(v, 3)}${unit === "°" ? "°" : ""}`;
  const outliers = s.outliers.values.map((o) => ({ x: o.value, y: top * 0.03 }));
  return (
    <ComposedChart responsive style={{ width: "100%", height: 280 }} data={h.curve} margin={{ top: 18, right: 16, bottom: 4, left: 0 }}>
      <CartesianGrid {...gridProps} vertical={false} />
      <XAxis
        dataKey="x"
        type="number"
        domain={h.domain}
        allowDataOverflow
        tick={axisTick}
        axisLine={axisLine}
        tickLine={false}
        tickFormatter={tick}
        ticks={niceTicks(h.domain[0], h.domain[1], 8)}
        height={30}
        label={{ value: `${s.source ?? s.column}${unit && unit !== "°" ? ` (${unit})` : unit ? " (deg)" : ""}`, position: "insideBottomRight", offset: -2, fontSize: 10.5, fill: "rgba(23,33,43,0.55)" }}
      />
      <YAxis domain={[0, top]} ticks={yTicks} allowDecimals={false} tick={axisTick} axisLine={axisLine} tickLine={false} width={36} />
      {h.bins.map((b, i) => (
        <ReferenceArea key={i} x1={b.from} x2={b.to} y1={0} y2={b.count} fill={BAR} fillOpacity={0.5} stroke={BAR} strokeOpacity={0.85} ifOverflow="extendDomain" />
      ))}
      {c ? (
        <ReferenceLine x={c.lsl} stroke={FAIL} strokeWidth={1.5} strokeDasharray="5 3" label={{ value: "LSL", position: "insideTopLeft", fontSize: 10.5, fill: FAIL, fontWeight: 700 }} />
      ) : null}
      {c ? (
        <ReferenceLine x={c.usl} stroke={FAIL} strokeWidth={1.5} strokeDasharray="5 3" label={{ value: "USL", position: "insideTopRight", fontSize: 10.5, fill: FAIL, fontWeight: 700 }} />
      ) : null}
      {s.tolerance ? <ReferenceLine x={s.tolerance.mean} stroke={PASS} strokeOpacity={0.6} strokeDasharray="2 3" /> : null}
      <ReferenceLine x={s.summary.mean} stroke={INK} strokeOpacity={0.5} label={{ value: "mean", position: "top", fontSize: 10, fill: "rgba(23,33,43,0.6)" }} />
      {h.curve.length ? <Line type="monotone" dataKey="y" stroke={INK} strokeWidth={1.6} dot={false} isAnimationActive={false} name="Fitted normal" /> : null}
      {outliers.length ? <Scatter data={outliers} dataKey="y" fill={FAIL} isAnimationActive={false} name="Outliers" /> : null}
    </ComposedChart>
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

function Legend({ swatch, children }: { swatch: ReactNode; children: ReactNode }) {
  return (
    <span className="inline-flex items-center gap-1.5">
      {swatch}
      {children}
    </span>
  );
}
