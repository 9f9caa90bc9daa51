import { useMemo, useState } from "react";
import { Area, CartesianGrid, ComposedChart, Line, ReferenceLine, Tooltip, XAxis, YAxis } from "recharts";
import { ChartDownload } from "@frontend/components/ui/chart-download";
import type { ResultFile } from "@shared/schemas/result-file";
import { envelopeByTilt, envelopeExtent, type TiltSeries } from "../lib/envelope";
import { axisLine, axisTick, axisWidthFor, FAIL, gridProps, INK, tooltipStyle } from "./chart-theme";
import { SegmentedControl } from "./segmented-control";
import { formatDeg, formatMrad, formatSignedTick } from "@shared/format";

type Envelope = NonNullable<ResultFile["envelope"]>;

export type EnvelopeLayer = { key: string; name: string; colour: string; envelope: Envelope };

/**
 * Heading error against heading, one small chart per tilt: the 5th–95th percentile band
 * over trials and the median line. Several layers (compare) are overlaid in their colours.
 */
export function EnvelopeCharts({ layers, limitDeg }: { layers: EnvelopeLayer[]; limitDeg?: number }) {
  const [extremes, setExtremes] = useState(false);
  const perLayer = useMemo(() => layers.map((l) => ({ ...l, series: envelopeByTilt(l.envelope) })), [layers]);
  const tilts = perLayer[0]?.series ?? [];
  const extent = useMemo(
    () => Math.max(...perLayer.map((l) => envelopeExtent(l.series, extremes, limitDeg))),
    [perLayer, extremes, limitDeg],
  );
  if (!tilts.length) return null;
  return (
    <div>
      <div className="mb-2 flex flex-wrap items-center justify-between gap-3">
        <p className="text-xs text-ink/60">
          Error of the tilt-compensated heading, estimated − true, at a dip of{" "}
          <span className="font-semibold text-ink tabular-nums">{formatDeg(layers[0].envelope.inclinationDeg, 4)}</span>
          {layers.length > 1 && layers[1].envelope.inclinationDeg !== layers[0].envelope.inclinationDeg ? (
            <>
              {" "}
              and <span className="font-semibold text-ink tabular-nums">{formatDeg(layers[1].envelope.inclinationDeg, 4)}</span>
            </>
          ) : null}
          ; compass from <span className="font-mono">{layers[0].envelope.accel}</span> and{" "}
          <span className="font-mono">{layers[0].envelope.mag}</span>.
        </p>
        <div className="flex items-center gap-3">
          <Legend layers={layers} extremes={extremes} limit={limitDeg !== undefined} />
          <SegmentedControl
            label="Envelope range"
            value={extremes ? "extremes" : "band"}
            onChange={(v) => setExtremes(v === "extremes")}
            options={[
              { value: "band", label: "p5–p95" },
              { value: "extremes", label: "+ min/max" },
            ]}
          />
        </div>
      </div>
      <div className="grid grid-cols-2 gap-3 md:grid-cols-3 xl:grid-cols-5">
        {tilts.map((t, i) => (
          <TiltChart
            key={t.key}
            tilt={t}
            layers={perLayer.map((l) => ({
              key: l.key,
              name: l.name,
              colour: l.colour,
              series: l.series.find((s) => s.key === t.key) ?? null,
            }))}
            extent={extent}
            extremes={extremes}
            limitDeg={limitDeg}
            showYLabel={i === 0}
          />
        ))}
      </div>
    </div>
  );
}

function Legend({ layers, extremes, limit }: { layers: EnvelopeLayer[]; extremes: boolean; limit: boolean }) {
  return (
    <ul className="flex flex-wrap items-center gap-x-3 gap-y-1 text-2xs text-ink/65" aria-label="Legend">
      {layers.map((l) => (
        <li key={l.key} className="flex items-center gap-1.5">
          <span className="h-2.5 w-4 rounded-sm" style={{ background: l.colour, opacity: 0.28 }} aria-hidden="true" />
          <span className="h-0.5 w-3" style={{ background: l.colour }} aria-hidden="true" />
          {layers.length > 1 ? `${l.name}: p5–p95, p50` : "p5–p95 band, p50 line"}
        </li>
      ))}
      {extremes ? (
        <li className="flex items-center gap-1.5">
          <span className="w-4 border-t border-dashed border-ink/50" aria-hidden="true" />
          min / max
        </li>
      ) : null}
      {limit ? (
        <li className="flex items-center gap-1.5">
          <span className="w-4 border-t-2 border-dashed border-fail" aria-hidden="true" />
          limit
        </li>
      ) : null}
    </ul>
  );
}

type Row = Record<string, number | [number, number]>;

function TiltChart({
  tilt,
  layers,
  extent,
  extremes,
  limitDeg,
  showYLabel,
}: {
  tilt: TiltSeries;
  layers: { key: string; name: string; colour: string; series: TiltSeries | null }[];
  extent: number;
  extremes: boolean;
  limitDeg?: number;
  showYLabel: boolean;
}) {
  // One row per heading holding every layer's values under its own keys.
  const data = useMemo(() => {
    const rows = new Map<number, Row>();
    for (const l of layers) {
      for (const r of l.series?.rows ?? []) {
        const row = rows.get(r.headingDeg) ?? { headingDeg: r.headingDeg };
        row[`${l.key}_band`] = r.band;
        row[`${l.key}_p50`] = r.p50;
        row[`${l.key}_min`] = r.min;
        row[`${l.key}_max`] = r.max;
        rows.set(r.headingDeg, row);
      }
    }
    return [...rows.values()].sort((a, b) => (a.headingDeg as number) - (b.headingDeg as number));
  }, [layers]);

  // signed ticks held whole: the axis is as wide as its longest label ("−0.125°")
  const yTicks = [-extent, -extent / 2, 0, extent / 2, extent];
  const yLabel = (v: number) => formatSignedTick(v, "deg");

  return (
    <figure
      className="min-w-0 rounded-md border border-line/80 bg-white/60 px-1 pt-1.5 pb-1"
      data-chart="envelope"
      aria-label={`Heading error envelope, ${tilt.label}`}
    >
      <figcaption className="flex items-center justify-between gap-2 px-2 text-[11.5px] font-bold text-ink">
        {tilt.label}
        <ChartDownload
          name={`heading-envelope-pitch${tilt.pitchDeg}-roll${tilt.rollDeg}`}
          title={`Heading error envelope, ${tilt.label}`}
        />
      </figcaption>
      <ComposedChart responsive style={{ width: "100%", height: 170 }} data={data} margin={{ top: 6, right: 8, bottom: 0, left: 0 }}>
        <CartesianGrid {...gridProps} />
        <XAxis
          dataKey="headingDeg"
          type="number"
          domain={[0, 360]}
          ticks={[0, 90, 180, 270, 360]}
          tick={axisTick}
          axisLine={axisLine}
          tickLine={false}
          tickFormatter={(v: number) => `${v}°`}
          height={18}
        />
        <YAxis
          domain={[-extent, extent]}
          ticks={yTicks}
          tick={axisTick}
          axisLine={axisLine}
          tickLine={false}
          width={axisWidthFor(yTicks.map(yLabel), showYLabel ? 40 : 34)}
          tickFormatter={yLabel}
          allowDataOverflow
        />
        <ReferenceLine y={0} stroke={INK} strokeOpacity={0.35} />
        {limitDeg !== undefined ? (
          <>
            <ReferenceLine y={limitDeg} stroke={FAIL} strokeDasharray="4 3" strokeWidth={1.25} />
            <ReferenceLine y={-limitDeg} stroke={FAIL} strokeDasharray="4 3" strokeWidth={1.25} />
          </>
        ) : null}
        <Tooltip
          {...tooltipStyle}
          labelFormatter={(v) => `Heading ${v}°`}
          formatter={(value, name) => {
            const fmt = (x: number) => `${formatDeg(x)} (${formatMrad(x)})`;
            const text = Array.isArray(value) ? `${fmt(Number(value[0]))} … ${fmt(Number(value[1]))}` : fmt(Number(value));
            return [text, name];
          }}
        />
        {layers.map((l) => (
          <Area
            key={`${l.key}-band`}
            dataKey={`${l.key}_band`}
            name={layers.length > 1 ? `${l.name} p5–p95` : "p5–p95"}
            stroke={l.colour}
            strokeOpacity={0.45}
            strokeWidth={0.75}
            fill={l.colour}
            fillOpacity={layers.length > 1 ? 0.16 : 0.22}
            isAnimationActive={false}
            activeDot={false}
          />
        ))}
        {extremes
          ? layers.flatMap((l) => [
              <Line
                key={`${l.key}-min`}
                dataKey={`${l.key}_min`}
                name={`${layers.length > 1 ? `${l.name} ` : ""}min`}
                stroke={l.colour}
                strokeOpacity={0.7}
                strokeDasharray="3 3"
                strokeWidth={1}
                dot={false}
                isAnimationActive={false}
              />,
              <Line
                key={`${l.key}-max`}
                dataKey={`${l.key}_max`}
                name={`${layers.length > 1 ? `${l.name} ` : ""}max`}
                stroke={l.colour}
                strokeOpacity={0.7}
                strokeDasharray="3 3"
                strokeWidth={1}
                dot={false}
                isAnimationActive={false}
              />,
            ])
          : null}
        {layers.map((l) => (
          <Line
            key={`${l.key}-p50`}
            dataKey={`${l.key}_p50`}
            name={layers.length > 1 ? `${l.name} p50` : "p50"}
            stroke={l.colour}
            strokeWidth={1.75}
            dot={false}
            isAnimationActive={false}
          />
        ))}
      </ComposedChart>
    </figure>
  );
}
