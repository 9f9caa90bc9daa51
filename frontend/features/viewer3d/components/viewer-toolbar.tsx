/** The 3D view's toolbar: pose and trial, angle exaggeration, explode, section plane, axes and the picture export. */
import { cn } from "@frontend/lib/cn";
import type { ViewerPose } from "../hooks/use-viewer-pose";
import type { ViewSettings } from "../hooks/use-view-settings";
import { EXAGGERATION_STOPS, fmt, fmtMm, fromSlider, sectionSign, toSlider } from "../lib/viewer-format";
import { formatCount, formatNumberUnit } from "@shared/format";

export function ViewerToolbar({
  pose,
  settings,
  onSave,
  canSave,
}: {
  pose: ViewerPose;
  settings: ViewSettings;
  onSave: () => void;
  canSave: boolean;
}) {
  return (
    <div
      className="flex flex-wrap items-center gap-x-4 gap-y-2 border-b border-line px-3 py-2 text-xs"
      role="toolbar"
      aria-label="3D view settings"
    >
      <label className="flex items-center gap-1.5">
        <span className="font-semibold text-ink/70">Pose</span>
        <select
          aria-label="Pose"
          className="h-7 max-w-[15rem] rounded-md border border-line bg-white px-1.5 text-xs hover:border-ink/30 focus:border-gyro focus:outline-none"
          value={pose.selectValue}
          onChange={(e) => pose.onPoseSelect(e.target.value)}
        >
          <option value="nominal">Nominal (design intent)</option>
          <option value="mean">Tolerance means</option>
          <option value="trial" disabled={!pose.vm?.hasStudy}>
            Trial by index{pose.vm?.hasStudy ? "" : " (needs a study)"}
          </option>
          {pose.worst.length > 0 ? (
            <optgroup label="Worst trial for">
              {pose.worst.map((w, i) => (
                <option key={`${w.metric}-${w.trialIndex}-${i}`} value={`worst:${i}`}>
                  {w.metric}: {formatNumberUnit(w.value, w.unit)} (trial {w.trialIndex})
                </option>
              ))}
            </optgroup>
          ) : null}
        </select>
      </label>
      {pose.vm?.hasStudy ? (
        <div className="flex items-center gap-1">
          <span className="font-semibold text-ink/70">Trial</span>
          <button
            type="button"
            aria-label="Previous trial"
            className="h-7 rounded-md border border-line bg-white px-1.5 hover:border-ink/30 disabled:opacity-50"
            disabled={pose.trial == null || pose.trial <= 0}
            onClick={() => pose.trial != null && pose.commitTrial(String(pose.trial - 1))}
          >
            ‹
          </button>
          <input
            aria-label="Trial index"
            inputMode="numeric"
            className="num h-7 w-20 rounded-md border border-line bg-white px-1.5 text-xs hover:border-ink/30 focus:border-gyro focus:outline-none"
            value={pose.trialText}
            placeholder="—"
            onChange={(e) => pose.setTrialText(e.target.value.replace(/[^0-9]/g, ""))}
            onBlur={(e) => pose.commitTrial(e.target.value)}
            onKeyDown={(e) => {
              if (e.key === "Enter") pose.commitTrial((e.target as HTMLInputElement).value);
            }}
          />
          <button
            type="button"
            aria-label="Next trial"
            className="h-7 rounded-md border border-line bg-white px-1.5 hover:border-ink/30 disabled:opacity-50"
            disabled={pose.trial != null && pose.trial >= pose.trials - 1}
            onClick={() => pose.commitTrial(String(pose.trial == null ? 0 : pose.trial + 1))}
          >
            ›
          </button>
          <span className="text-ink/50">of {formatCount(pose.trials)}</span>
        </div>
      ) : null}
      <div className="flex items-center gap-2">
        <label className="flex items-center gap-1.5" title="Tilts and rotations are multiplied by this factor; lengths stay true to scale">
          <span className="font-semibold text-ink/70">Angles</span>
          <input
            type="range"
            aria-label="Angle exaggeration"
            min={0}
            max={100}
            step={0.5}
            value={toSlider(settings.exaggeration)}
            onChange={(e) => settings.setExaggeration(fromSlider(Number(e.target.value)))}
            className="w-28 accent-gyro"
          />
          <output className="w-10 font-semibold text-ink tabular-nums" aria-live="polite" data-testid="exaggeration-value">
            ×{settings.exaggeration}
          </output>
        </label>
        <div className="flex items-center gap-0.5" role="group" aria-label="Exaggeration presets">
          {EXAGGERATION_STOPS.map((k) => (
            <button
              key={k}
              type="button"
              aria-pressed={settings.exaggeration === k}
              className={cn(
                "h-6 rounded px-1.5 text-2xs font-semibold",
                settings.exaggeration === k ? "bg-ink text-paper" : "text-ink/60 hover:bg-ink/[0.06] hover:text-ink",
              )}
              onClick={() => settings.setExaggeration(k)}
            >
              ×{k}
            </button>
          ))}
        </div>
      </div>
      <label className="flex items-center gap-1.5" title="Lifts every level of the stack above its parent">
        <span className="font-semibold text-ink/70">Explode</span>
        <input
          type="range"
          aria-label="Explode gap (mm)"
          min={0}
          max={1.5}
          step={0.05}
          value={settings.explode}
          onChange={(e) => settings.setExplode(Number(e.target.value))}
          className="w-24 accent-gyro"
        />
        <output className="num w-14 text-ink">{fmtMm(settings.explode)}</output>
      </label>
      <div className="flex items-center gap-1.5">
        <span className="font-semibold text-ink/70">Section</span>
        <div className="flex rounded-md border border-line bg-white p-0.5" role="group" aria-label="Section plane">
          {(["off", "x", "y"] as const).map((a) => (
            <button
              key={a}
              type="button"
              aria-pressed={settings.section.axis === a}
              className={cn(
                "h-5.5 rounded px-1.5 text-2xs font-semibold",
                settings.section.axis === a ? "bg-ink text-paper" : "text-ink/65 hover:text-ink",
              )}
              onClick={() => settings.setSectionAxis(a)}
            >
              {a === "off" ? "Off" : `${a} cut`}
            </button>
          ))}
        </div>
        {settings.sectionBounds ? (
          <>
            <input
              type="range"
              aria-label={`Section position along ${settings.section.axis} (mm)`}
              min={settings.sectionBounds.min}
              max={settings.sectionBounds.max}
              step={0.01}
              value={settings.section.value}
              onChange={(e) => settings.setSection((s) => ({ ...s, value: Number(e.target.value) }))}
              className="w-24 accent-gyro"
            />
            <output className="num w-[4.5rem] text-ink">
              {settings.section.axis} {sectionSign(settings.section.axis, settings.section.flip)} {fmt(settings.section.value)}
            </output>
            <button
              type="button"
              className="h-6 rounded px-1.5 text-2xs font-semibold text-ink/60 hover:bg-ink/[0.06] hover:text-ink"
              onClick={() => settings.setSection((s) => ({ ...s, flip: !s.flip }))}
              title="Keep the other side of the plane"
            >
              Flip
            </button>
          </>
        ) : null}
      </div>
      <label className="flex items-center gap-1.5">
        <input
          type="checkbox"
          checked={settings.showAxes}
          onChange={(e) => settings.setShowAxes(e.target.checked)}
          className="accent-gyro"
        />
        <span className="font-semibold text-ink/70">Sensing axes</span>
      </label>
      <button
        type="button"
        onClick={onSave}
        disabled={!canSave}
        title="A PNG at twice the view's size, with its caption and legend inside the picture"
        className="ml-auto inline-flex h-7 items-center gap-1.5 rounded-md border border-ink bg-ink px-2.5 text-xs font-semibold text-paper hover:bg-ink/90 disabled:opacity-55"
      >
        <svg viewBox="0 0 16 16" className="size-3.5" aria-hidden="true">
          <path
            d="M8 2v8m0 0 3-3m-3 3L5 7M3 12.5h10"
            stroke="currentColor"
            strokeWidth="1.6"
            fill="none"
            strokeLinecap="round"
            strokeLinejoin="round"
          />
        </svg>
        Save picture
      </button>
    </div>
  );
}
