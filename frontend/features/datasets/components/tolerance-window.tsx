import type { DatasetStatistics } from "@shared/schemas/datasets";
import { FAIL, INK, PASS } from "@frontend/features/studies";
import { formatMeasure, unitText } from "@shared/format";
import { niceTicks } from "../lib/ticks";

/** Two alternating lot tones, so neighbouring lots read apart without a legend of colours. */
const LOT_TONES = ["#0d9488", "#6366f1"];
const W = 760,
  H = 300,
  MR_H = 70;
const PAD = { left: 56, right: 12, top: 12, bottom: 22 };
const DIST_W = 130;
const GAP = 14;

/**
 * The tolerance window drawn as the frame: the value runs up the page, the band between the
 * limits is the plot, anything beyond is on the shaded margins. On the left each unit is a
 * point in production order (lots alternate in tone, their boundaries marked), with the
 * individuals chart's centre and control limits; on the right, sharing the same scale, the
 * distribution lies on its side: the measured counts and the fitted normal. Below, the
 * moving ranges of consecutive units against their upper limit.
 */
export function ToleranceWindow({ s }: { s: DatasetStatistics }) {
  const chart = s.controlChart;
  const c = s.capability;
  const points = chart?.points ?? [];
  const values = points.map((p) => p.x);
  const lo0 = Math.min(...values, c?.lsl ?? Infinity, chart?.x.lcl ?? Infinity, s.summary.min);
  const hi0 = Math.max(...values, c?.usl ?? -Infinity, chart?.x.ucl ?? -Infinity, s.summary.max);
  const span = hi0 - lo0 || Math.abs(hi0) || 1;
  const lo = lo0 - span * 0.08,
    hi = hi0 + span * 0.08;
  const plotH = H - PAD.top - PAD.bottom;
  const y = (v: number) => PAD.top + ((hi - v) / (hi - lo)) * plotH;
  const runLeft = PAD.left,
    runRight = W - PAD.right - DIST_W - GAP;
  const distLeft = runRight + GAP,
    distRight = W - PAD.right;
  const n = Math.max(points.length, 1);
  const x = (order: number) => runLeft + ((order - 0.5) / n) * (runRight - runLeft);
  const unit = unitText(s.unit);
  const tick = (v: number) => `${formatMeasure(v, 3)}${unit === "°" ? "°" : ""}`;

  // lots in production order: where each starts, for the boundary marks
  const lotStarts: { order: number; lot: string; tone: string }[] = [];
  points.forEach((p) => {
    if (p.lot !== null && (lotStarts.length === 0 || lotStarts[lotStarts.length - 1].lot !== p.lot)) {
      lotStarts.push({ order: p.order, lot: p.lot, tone: LOT_TONES[lotStarts.length % 2] });
    }
  });
  const toneOf = (order: number) => {
    let t = LOT_TONES[0];
    for (const l of lotStarts) if (l.order <= order) t = l.tone;
    return t;
  };

  // the distribution on its side: bins as horizontal bars, the fitted normal as a curve
  const h = s.histogram;
  const maxCount = Math.max(1, ...h.bins.map((b) => b.count), ...h.curve.map((p) => p.y));
  const dx = (count: number) => distLeft + (count / maxCount) * (distRight - distLeft);
  const curve = h.curve.filter((p) => p.x >= lo && p.x <= hi);

  const mrPoints = points.filter((p) => p.mr !== null);
  const mrTop = Math.max(chart?.mr.ucl ?? 0, ...mrPoints.map((p) => p.mr!)) * 1.1 || 1;
  const my = (v: number) => H + 10 + (1 - v / mrTop) * (MR_H - 20);

  return (
    <svg
      viewBox={`0 0 ${W} ${H + MR_H}`}
      className="h-auto w-full"
      role="img"
      aria-label={`Units of ${s.column} in production order inside the tolerance window`}
      data-chart="tolerance-window"
    >
      {/* outside the window: shaded margins */}
      {c ? (
        <>
          <rect
            x={runLeft}
            y={PAD.top}
            width={distRight - runLeft}
            height={Math.max(0, y(c.usl) - PAD.top)}
            fill={FAIL}
            fillOpacity={0.07}
            data-zone="above"
          />
          <rect
            x={runLeft}
            y={y(c.lsl)}
            width={distRight - runLeft}
            height={Math.max(0, H - PAD.bottom - y(c.lsl))}
            fill={FAIL}
            fillOpacity={0.07}
            data-zone="below"
          />
          <line x1={runLeft} x2={distRight} y1={y(c.usl)} y2={y(c.usl)} stroke={FAIL} strokeWidth={1.4} />
          <line x1={runLeft} x2={distRight} y1={y(c.lsl)} y2={y(c.lsl)} stroke={FAIL} strokeWidth={1.4} />
          <text x={distRight} y={y(c.usl) - 4} textAnchor="end" fontSize={10.5} fontWeight={700} fill={FAIL}>
            upper limit {tick(c.usl)}
          </text>
          <text x={distRight} y={y(c.lsl) + 12} textAnchor="end" fontSize={10.5} fontWeight={700} fill={FAIL}>
            lower limit {tick(c.lsl)}
          </text>
        </>
      ) : null}
      {s.tolerance ? (
        <line
          x1={runLeft}
          x2={distRight}
          y1={y(s.tolerance.mean)}
          y2={y(s.tolerance.mean)}
          stroke={PASS}
          strokeOpacity={0.7}
          strokeDasharray="2 3"
        />
      ) : null}
      {/* value axis */}
      {niceTicks(lo, hi, 6).map((v) => (
        <g key={v}>
          <line x1={runLeft - 4} x2={runLeft} y1={y(v)} y2={y(v)} stroke={INK} strokeOpacity={0.4} />
          <text x={runLeft - 6} y={y(v) + 3.5} textAnchor="end" fontSize={10} fill={INK} fillOpacity={0.6}>
            {tick(v)}
          </text>
        </g>
      ))}
      <text
        x={12}
        y={PAD.top + plotH / 2}
        transform={`rotate(-90 12 ${PAD.top + plotH / 2})`}
        textAnchor="middle"
        fontSize={10.5}
        fill={INK}
        fillOpacity={0.6}
      >
        {s.source ?? s.column}
        {unit && unit !== "°" ? ` (${unit})` : ""}
      </text>
      {/* production order: control limits, centre, lots, units */}
      {chart ? (
        <g data-layer="control-limits">
          {[chart.x.lcl, chart.x.ucl].map((v, i) => (
            <line key={i} x1={runLeft} x2={runRight} y1={y(v)} y2={y(v)} stroke={INK} strokeOpacity={0.45} strokeDasharray="6 4" />
          ))}
          <line x1={runLeft} x2={runRight} y1={y(chart.x.centre)} y2={y(chart.x.centre)} stroke={INK} strokeOpacity={0.55} />
        </g>
      ) : null}
      {lotStarts.map((l, i) => (
        <g key={`${l.lot}-${i}`}>
          {i > 0 ? (
            <line
              x1={x(l.order) - (runRight - runLeft) / n / 2}
              x2={x(l.order) - (runRight - runLeft) / n / 2}
              y1={PAD.top}
              y2={H - PAD.bottom}
              stroke={INK}
              strokeOpacity={0.25}
            />
          ) : null}
          <text x={x(l.order) - (runRight - runLeft) / n / 2 + 3} y={H - PAD.bottom + 14} fontSize={10} fill={l.tone} fontWeight={700}>
            {l.lot}
          </text>
        </g>
      ))}
      <polyline points={points.map((p) => `${x(p.order)},${y(p.x)}`).join(" ")} fill="none" stroke={INK} strokeOpacity={0.18} />
      {points.map((p) => (
        <circle
          key={p.order}
          data-unit={p.order}
          cx={x(p.order)}
          cy={y(p.x)}
          r={p.outX ? 3.6 : 2.8}
          fill={p.outX ? FAIL : toneOf(p.order)}
          stroke={p.outX ? FAIL : "none"}
        >
          <title>{`unit ${p.order} (row ${p.row}${p.lot ? `, lot ${p.lot}` : ""}): ${tick(p.x)}`}</title>
        </circle>
      ))}
      {lotStarts.length === 0 ? (
        <text x={runLeft} y={H - PAD.bottom + 14} fontSize={10} fill={INK} fillOpacity={0.55}>
          units in file order →
        </text>
      ) : null}
      {/* the distribution on its side */}
      <line x1={distLeft} x2={distLeft} y1={PAD.top} y2={H - PAD.bottom} stroke={INK} strokeOpacity={0.3} />
      {h.bins.map((b, i) => (
        <rect
          key={i}
          x={distLeft}
          y={y(b.to)}
          width={dx(b.count) - distLeft}
          height={Math.max(0.5, y(b.from) - y(b.to))}
          fill={LOT_TONES[0]}
          fillOpacity={0.35}
        />
      ))}
      {curve.length ? (
        <polyline
          data-layer="fitted-normal"
          points={curve.map((p) => `${dx(p.y)},${y(p.x)}`).join(" ")}
          fill="none"
          stroke={INK}
          strokeWidth={1.4}
        />
      ) : null}
      <text x={distLeft + 2} y={H - PAD.bottom + 14} fontSize={10} fill={INK} fillOpacity={0.55}>
        distribution
      </text>
      {/* moving ranges */}
      {chart ? (
        <g data-layer="moving-range">
          <text x={runLeft - 6} y={H + 14} textAnchor="end" fontSize={10} fill={INK} fillOpacity={0.6}>
            MR
          </text>
          <line
            x1={runLeft}
            x2={runRight}
            y1={my(chart.mr.ucl)}
            y2={my(chart.mr.ucl)}
            stroke={INK}
            strokeOpacity={0.45}
            strokeDasharray="6 4"
          />
          <line x1={runLeft} x2={runRight} y1={my(chart.mr.centre)} y2={my(chart.mr.centre)} stroke={INK} strokeOpacity={0.55} />
          <line x1={runLeft} x2={runRight} y1={my(0)} y2={my(0)} stroke={INK} strokeOpacity={0.3} />
          <polyline points={mrPoints.map((p) => `${x(p.order)},${my(p.mr!)}`).join(" ")} fill="none" stroke={INK} strokeOpacity={0.35} />
          {mrPoints.map((p) => (
            <circle
              key={p.order}
              cx={x(p.order)}
              cy={my(p.mr!)}
              r={p.outMr ? 3 : 2.2}
              fill={p.outMr ? FAIL : INK}
              fillOpacity={p.outMr ? 1 : 0.55}
            />
          ))}
          <text x={runRight + 4} y={my(chart.mr.ucl) + 3.5} fontSize={9.5} fill={INK} fillOpacity={0.6}>
            {`UCL ${tick(chart.mr.ucl)}`}
          </text>
        </g>
      ) : null}
    </svg>
  );
}
