/**
 * The stack as a dimensioned orthographic drawing, in the page as SVG: the top view (every
 * footprint with its balloon, keyed to the positions beside it, and the package's length and
 * width) and the side section along x (thicknesses, bond lines, overall height), each to a
 * stated drafting scale at 100 % zoom (CSS pixels are 1/96 in). The geometry, the words and
 * the scale come from shared/stack-drawing.ts, the same module the report's PDF draws from.
 */
import { useMemo } from "react";
import type { StackFile } from "@shared/schemas/stack-file";
import { DRAWING_COLOUR, KIND_COLOUR, PALETTE } from "@shared/palette";
import {
  drawingScale,
  drawnElements,
  DRAWING_WORDS,
  placeBalloons,
  placeStack,
  PX_PER_MM,
  scaleBarStepMm,
  sideSection,
  topView,
  topViewExtent,
  type Dimension,
  type Pt,
} from "@shared/stack-drawing";
import { ChartDownload, ChartFileName } from "@frontend/components/ui/chart-download";
import { useEditor } from "./editor-context";

const TOP_W = 460;
const TOP_H = 320;
const SIDE_W = 760;
const LABEL_W = 270;
const MUTED = "rgba(23,33,43,0.6)";
const colourOf = (kind: string) => (KIND_COLOUR as Record<string, string>)[kind] ?? MUTED;

function Arrows({ id }: { id: string }) {
  return (
    <defs>
      <marker id={id} viewBox="0 0 8 6" refX="8" refY="3" markerWidth="8" markerHeight="6" orient="auto-start-reverse">
        <path d="M0 0L8 3L0 6Z" fill={PALETTE.ink} />
      </marker>
    </defs>
  );
}

/** A dimension line with arrows at both ends and its value: above a horizontal one, left of a vertical one. */
function DimensionLine({ ends: [a, b], label, marker, testId }: { ends: [Pt, Pt]; label: string; marker: string; testId: string }) {
  const vertical = Math.abs(a[0] - b[0]) < Math.abs(a[1] - b[1]);
  const mx = (a[0] + b[0]) / 2;
  const my = (a[1] + b[1]) / 2;
  return (
    <g data-dimension={testId}>
      <line
        x1={a[0]}
        y1={a[1]}
        x2={b[0]}
        y2={b[1]}
        stroke={PALETTE.ink}
        strokeWidth={0.75}
        markerStart={`url(#${marker})`}
        markerEnd={`url(#${marker})`}
      />
      <text x={vertical ? mx - 5 : mx} y={vertical ? my + 3.5 : my - 4} textAnchor={vertical ? "end" : "middle"} fontSize={10.5}>
        {label}
      </text>
    </g>
  );
}

function ScaleBar({ x, y, scale, label }: { x: number; y: number; scale: number; label: string }) {
  const step = scaleBarStepMm(scale);
  const len = step * scale * PX_PER_MM;
  return (
    <g data-scale={scale}>
      <line x1={x} y1={y} x2={x + len} y2={y} stroke={PALETTE.ink} strokeWidth={1.5} />
      <line x1={x} y1={y - 4} x2={x} y2={y + 4} stroke={PALETTE.ink} />
      <line x1={x + len} y1={y - 4} x2={x + len} y2={y + 4} stroke={PALETTE.ink} />
      <text x={x + len + 5} y={y + 3.5} fontSize={10} fill={MUTED}>
        {step} mm
      </text>
      <text x={x} y={y + 18} fontSize={11} fontWeight={700}>
        {label} · scale {scale}:1 on screen at 100 % zoom
      </text>
    </g>
  );
}

export function StackDrawing({ stack, revisionNumber }: { stack: StackFile | null; revisionNumber: number }) {
  const { selectedId, select, warnings } = useEditor();
  const drawing = useMemo(() => {
    if (!stack) return null;
    const placed = placeStack(drawnElements(stack));
    if (!placed.some((p) => p.depth > 0)) return null;
    return { top: topView(placed), side: sideSection(placed) };
  }, [stack]);
  if (!stack || !drawing) {
    return (
      <p className="p-4 text-[13px] text-ink/55">
        {stack ? "Put a package on the board to see its drawing." : "The drawing shows once the stack has no problems."}
      </p>
    );
  }
  const flagged = new Set([...warnings.keys()].flatMap((i) => stack.elements[i]?.id ?? []));
  const { top, side } = drawing;

  // ---- top view, as the PDF lays it out: the drafting scale that fits the box, the footprints centred
  const topScale = drawingScale(topViewExtent(top, TOP_H / TOP_W), TOP_H - 60, PX_PER_MM);
  const k = topScale * PX_PER_MM;
  const { minX, maxX, minY, maxY } = top.bounds;
  const X = (v: number) => TOP_W / 2 - ((minX + maxX) / 2) * k + v * k;
  const Y = (v: number) => TOP_H / 2 + ((minY + maxY) / 2) * k - v * k;
  const balloons = placeBalloons(
    top.items.map((it) => [X(it.balloonAt[0]) + 10, Y(it.balloonAt[1]) - 10]),
    16,
    12,
  );
  const dim = (d: Dimension, off: Pt): [Pt, Pt] => [
    [X(d.from[0]) + off[0], Y(d.from[1]) + off[1]],
    [X(d.to[0]) + off[0], Y(d.to[1]) + off[1]],
  ];

  // ---- side section: the stack left of its labels, the board's top face at the base line
  const labelX = SIDE_W - LABEL_W;
  const sideH = Math.max(190, side.labels.length * 30 + 64);
  const sideScale = Math.min(drawingScale(side.maxX - side.minX, labelX - 110, PX_PER_MM), drawingScale(side.top, sideH - 60, PX_PER_MM));
  const ks = sideScale * PX_PER_MM;
  const base = sideH - 30;
  const SX = (v: number) => labelX / 2 - ((side.minX + side.maxX) / 2) * ks + v * ks;
  const SZ = (v: number) => base - v * ks;

  const stroke = (id: string, kind: string) => (flagged.has(id) ? PALETTE.warn : colourOf(kind));
  const name = stack.name ?? "stack";

  return (
    <ChartFileName value={`${name}-rev${revisionNumber}`}>
      <div className="flex flex-col gap-4 p-3">
        <div className="flex flex-wrap items-start gap-4">
          <figure aria-label="Top view of the stack" className="relative" data-drawing="top">
            <ChartDownload name="top-view" title={`${name}, revision ${revisionNumber}: top view`} className="absolute top-1 right-1" />
            <svg
              data-chart-surface
              width={TOP_W}
              height={TOP_H + 34}
              viewBox={`0 0 ${TOP_W} ${TOP_H + 34}`}
              role="img"
              aria-label={`Top view at ${topScale}:1`}
              fontFamily="Manrope, sans-serif"
              fill={PALETTE.ink}
            >
              <Arrows id="dim-arrow-top" />
              <rect x={0.5} y={0.5} width={TOP_W - 1} height={TOP_H - 1} rx={4} fill={DRAWING_COLOUR.sheet} stroke={PALETTE.line} />
              {top.items.map(({ p, corners, balloonAt, number }, i) => {
                const c = stroke(p.e.id, p.e.kind);
                const sel = p.e.id === selectedId;
                return (
                  <g key={p.e.id} data-element={p.e.id} onClick={() => select(p.e.id)} className="cursor-pointer">
                    <title>{`${number} ${p.e.name}`}</title>
                    <polygon
                      points={corners.map(([px, py]) => `${X(px)},${Y(py)}`).join(" ")}
                      fill={colourOf(p.e.kind)}
                      fillOpacity={sel ? 0.22 : 0.08}
                      stroke={c}
                      strokeWidth={sel || flagged.has(p.e.id) ? 2 : 1}
                    />
                    <path d={`M${X(p.cx) - 4} ${Y(p.cy)}h8M${X(p.cx)} ${Y(p.cy) - 4}v8`} stroke={colourOf(p.e.kind)} strokeWidth={0.75} />
                    <line x1={X(balloonAt[0])} y1={Y(balloonAt[1])} x2={balloons[i][0]} y2={balloons[i][1]} stroke={c} strokeWidth={0.6} />
                    <circle cx={balloons[i][0]} cy={balloons[i][1]} r={7.5} fill="#ffffff" stroke={c} />
                    <text x={balloons[i][0]} y={balloons[i][1] + 3.5} textAnchor="middle" fontSize={9.5} fontWeight={700}>
                      {number}
                    </text>
                  </g>
                );
              })}
              {top.dimensions ? (
                <>
                  <DimensionLine
                    marker="dim-arrow-top"
                    testId="length"
                    label={top.dimensions.x.label}
                    ends={dim(top.dimensions.x, [0, 18])}
                  />
                  <DimensionLine
                    marker="dim-arrow-top"
                    testId="width"
                    label={top.dimensions.y.label}
                    ends={dim(top.dimensions.y, [-18, 0])}
                  />
                </>
              ) : null}
              <g stroke={MUTED} strokeWidth={0.75}>
                <path d={`M14 ${TOP_H - 14}h26M14 ${TOP_H - 14}v-26`} />
              </g>
              <text x={44} y={TOP_H - 10} fontSize={10} fill={MUTED}>
                x
              </text>
              <text x={10} y={TOP_H - 44} fontSize={10} fill={MUTED}>
                y
              </text>
              <ScaleBar x={6} y={TOP_H + 10} scale={topScale} label={DRAWING_WORDS.topView} />
            </svg>
          </figure>
          <div className="min-w-[16rem] flex-1">
            <h3 className="mb-1 text-[10.5px] font-bold tracking-wide text-ink/55 uppercase">Positions on the parent</h3>
            <ol aria-label="Positions on the parent" className="grid gap-1.5">
              {top.items.map((it) => (
                <li key={it.p.e.id} data-element={it.p.e.id}>
                  <p className="text-[12px] font-bold text-ink">{it.head}</p>
                  <p className="pl-3 text-[11.5px] text-ink/60">{it.body}</p>
                </li>
              ))}
            </ol>
          </div>
        </div>
        <figure aria-label="Side section of the stack" className="relative max-w-full overflow-x-auto" data-drawing="side">
          {/* top left: the labels take the right-hand side */}
          <ChartDownload
            name="side-section"
            title={`${name}, revision ${revisionNumber}: side section`}
            className="absolute top-1 left-1"
          />
          <svg
            data-chart-surface
            width={SIDE_W}
            height={sideH + 34}
            viewBox={`0 0 ${SIDE_W} ${sideH + 34}`}
            role="img"
            aria-label={`Side section at ${sideScale}:1`}
            fontFamily="Manrope, sans-serif"
            fill={PALETTE.ink}
          >
            <Arrows id="dim-arrow-side" />
            <rect x={0.5} y={0.5} width={SIDE_W - 1} height={sideH - 1} rx={4} fill={DRAWING_COLOUR.sheet} stroke={PALETTE.line} />
            <rect x={8} y={base} width={labelX - 16} height={10} fill={PALETTE.board} fillOpacity={0.25} />
            <line x1={8} y1={base} x2={labelX - 8} y2={base} stroke={PALETTE.ink} />
            {side.items.map(({ p, x0, x1 }) => (
              <g key={p.e.id} data-element={p.e.id} onClick={() => select(p.e.id)} className="cursor-pointer">
                {p.z0 > p.bond0 ? (
                  <rect
                    data-bond-line={p.e.id}
                    x={SX(x0)}
                    y={SZ(p.z0)}
                    width={SX(x1) - SX(x0)}
                    height={Math.max(0.5, (p.z0 - p.bond0) * ks)}
                    fill={DRAWING_COLOUR.bondLine}
                    fillOpacity={0.9}
                  />
                ) : null}
                <rect
                  x={SX(x0)}
                  y={SZ(p.z1)}
                  width={SX(x1) - SX(x0)}
                  height={p.e.size.z * ks}
                  fill={colourOf(p.e.kind)}
                  fillOpacity={p.e.id === selectedId ? 0.5 : 0.3}
                  stroke={stroke(p.e.id, p.e.kind)}
                  strokeWidth={p.e.id === selectedId || flagged.has(p.e.id) ? 1.5 : 0.75}
                />
              </g>
            ))}
            {side.height ? (
              <DimensionLine
                marker="dim-arrow-side"
                testId="height"
                label={side.height.label}
                ends={[
                  [SX(side.height.from[0]) - 16, SZ(side.height.from[1])],
                  [SX(side.height.to[0]) - 16, SZ(side.height.to[1])],
                ]}
              />
            ) : null}
            {side.labels.map((s, i) => {
              const ly = 16 + i * 30;
              return (
                <g key={s.p.e.id} data-label={s.p.e.id}>
                  <line x1={SX(s.x1)} y1={SZ((s.p.z0 + s.p.z1) / 2)} x2={labelX - 6} y2={ly - 3} stroke={PALETTE.line} strokeWidth={0.6} />
                  <text x={labelX} y={ly} fontSize={11} fontWeight={700}>
                    {s.head}
                  </text>
                  <text x={labelX + 8} y={ly + 13} fontSize={10.5} fill={MUTED}>
                    {s.body}
                  </text>
                </g>
              );
            })}
            <rect x={labelX} y={side.labels.length * 30 + 8} width={12} height={5} fill={DRAWING_COLOUR.bondLine} />
            <text x={labelX + 17} y={side.labels.length * 30 + 14} fontSize={10.5} fill={MUTED}>
              {DRAWING_WORDS.bondLine}
            </text>
            <text x={labelX} y={side.labels.length * 30 + 28} fontSize={10.5} fill={MUTED}>
              {DRAWING_WORDS.heights}
            </text>
            <ScaleBar x={6} y={sideH + 10} scale={sideScale} label={DRAWING_WORDS.sideSection} />
          </svg>
        </figure>
      </div>
    </ChartFileName>
  );
}
