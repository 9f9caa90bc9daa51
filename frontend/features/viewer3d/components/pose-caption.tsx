/** The caption over the 3D view (which pose, how exaggerated, what was recomputed) and the camera presets. */
import { cn } from "@frontend/lib/cn";
import type { ViewerPose } from "../hooks/use-viewer-pose";
import type { ViewPreset } from "../lib/framing";
import { fmtMm } from "../lib/viewer-format";
import { formatNumberUnit } from "@shared/format";

export function PoseCaption({
  pose,
  exaggeration,
  explode,
  onView,
}: {
  pose: ViewerPose;
  exaggeration: number;
  explode: number;
  onView: (preset: ViewPreset) => void;
}) {
  const { poseLabel, pick, recomputed, mismatch, poseError, vm, choice, stackIssue, drawn } = pose;
  return (
    <div className="pointer-events-none absolute inset-x-2.5 top-2.5 flex flex-wrap items-start justify-between gap-2">
      <div className="max-w-[34rem] rounded-md bg-[#0f161d]/75 px-2.5 py-1.5 text-xs text-paper shadow-sm">
        <div className="font-bold" data-testid="pose-label">
          {poseLabel}
        </div>
        <div className="text-paper/65">
          Angles ×{exaggeration}
          {exaggeration > 1 ? " exaggerated" : " (true)"} · lengths to scale · mm
          {explode > 0 ? ` · exploded ${fmtMm(explode)}` : ""}
        </div>
        {pick && recomputed !== null ? (
          <div className={cn("mt-0.5", mismatch ? "font-semibold text-[#f5a08a]" : "text-paper/65")} data-testid="recomputed">
            {mismatch
              ? `Regenerated trial gives ${pick.metric} = ${formatNumberUnit(recomputed, pick.unit)}, not ${formatNumberUnit(pick.value, pick.unit)}: the stack or study changed since the study ran.`
              : `Regenerated from the seed: ${pick.metric} = ${formatNumberUnit(recomputed, pick.unit)}`}
          </div>
        ) : null}
        {poseError ? <div className="mt-0.5 font-semibold text-[#f5a08a]">{poseError}</div> : null}
        {vm && !vm.exact && choice.kind === "trial" && !poseError ? (
          <div className="mt-0.5 font-semibold text-[#f5a08a]">
            The study does not fit the edited stack: this trial is drawn from it only approximately.
          </div>
        ) : null}
        {stackIssue && drawn ? <div className="mt-0.5 font-semibold text-[#f5a08a]">Showing the last valid stack. {stackIssue}</div> : null}
      </div>

      {/* view presets */}
      <div
        className="pointer-events-auto ml-auto flex gap-0.5 rounded-md bg-[#0f161d]/75 p-0.5 text-2xs font-semibold"
        role="group"
        aria-label="View presets"
      >
        {(
          [
            ["package", "Package"],
            ["iso", "Iso"],
            ["top", "Top"],
            ["side", "Side"],
            ["end", "End"],
            ["board", "Whole board"],
          ] as const
        ).map(([p, label]) => (
          <button
            key={p}
            type="button"
            className="h-6 rounded px-2 text-paper/80 hover:bg-paper/10 hover:text-paper"
            onClick={() => onView(p)}
            title={
              p === "side"
                ? "Looking along +y"
                : p === "end"
                  ? "Looking along −x"
                  : p === "package"
                    ? "Frame the package"
                    : p === "board"
                      ? "Frame the whole board"
                      : undefined
            }
          >
            {label}
          </button>
        ))}
      </div>
    </div>
  );
}
