import type { ReactNode } from "react";
import type { StudyDetail } from "../api/get-study";
import { tiltLabel } from "../lib/envelope";
import { attitudeCount } from "../lib/study-form";
import { formatCount, formatDeg, formatDuration, formatMrad, formatNumber } from "@shared/format";

/** The frozen settings of a study and how its run went: what a reviewer needs to reproduce it. */
export function RunRecord({ study }: { study: StudyDetail }) {
  const s = study.study;
  const r = study.result;
  const residual = s.calibration?.residualDeg;
  const seconds = study.startedAt && study.finishedAt ? (Date.parse(study.finishedAt) - Date.parse(study.startedAt)) / 1000 : null;
  const tilts = s.tilts ?? [
    { pitchDeg: 0, rollDeg: 0 },
    { pitchDeg: 30, rollDeg: 0 },
    { pitchDeg: -30, rollDeg: 0 },
    { pitchDeg: 0, rollDeg: 30 },
    { pitchDeg: 0, rollDeg: -30 },
  ];
  return (
    <dl className="grid grid-cols-[minmax(8rem,auto)_1fr] gap-x-4 gap-y-1.5 text-xs">
      <Row label="Stack revision">
        {study.revisionNumber} <span className="text-ink/50">({String(study.stack.name ?? "")})</span>
      </Row>
      <Row label="Trials">
        <span className="tabular-nums">
          {r && r.trials !== s.trials ? `${formatCount(r.trials)} used of at most ${formatCount(s.trials)}` : formatCount(s.trials)}
        </span>
      </Row>
      <Row label="Seed">
        <span className="tabular-nums">{s.seed}</span>
      </Row>
      <Row label="Sampling">
        {s.sampling === "lhs" ? "Latin hypercube" : "Random"}
        {s.adaptive ? `, adaptive stopping (${s.adaptive.significantDigits ?? 2} significant digits)` : ""}
      </Row>
      <Row label="Field dip">
        <span className="tabular-nums">
          {formatDeg(s.inclinationDeg, 5)} ({formatMrad(s.inclinationDeg, 5)})
        </span>
      </Row>
      {study.site ? (
        <Row label="Site">
          <span className="tabular-nums">
            {formatNumber(study.site.site.latitudeDeg, 5)}°, {formatNumber(study.site.site.longitudeDeg, 5)}°,{" "}
            {formatNumber(study.site.site.altitudeKm, 3)} km, {study.site.site.date}
          </span>
          <span className="block text-ink/55 tabular-nums">
            {study.site.model}: declination {formatDeg(study.site.declinationDeg, 4)}, field {formatCount(study.site.totalIntensityNt)} nT
          </span>
        </Row>
      ) : null}
      <Row label="Heading sweep">
        <span className="tabular-nums">
          every {formatNumber(s.headingStepDeg ?? 10)}° at {tilts.map((t) => tiltLabel(t.pitchDeg, t.rollDeg).toLowerCase()).join(", ")} (
          {formatCount(attitudeCount(s))} attitudes)
        </span>
      </Row>
      <Row label="Calibration">
        {!s.calibration || s.calibration.after === "none"
          ? "None"
          : `After ${s.calibration.after}${residual && residual.tol !== undefined ? `, residual ${residual.dist} ± ${formatDeg(residual.tol)} (${formatMrad(residual.tol)})` : ""}`}
      </Row>
      {s.headingSensors ? (
        <Row label="Compass">
          <span className="font-mono">{s.headingSensors.accel}</span> + <span className="font-mono">{s.headingSensors.mag}</span>
        </Row>
      ) : null}
      {seconds !== null ? (
        <Row label="Run">
          <span className="tabular-nums">
            {formatDuration(seconds)}
            {study.progress.trialsPerSecond ? `, ${formatCount(study.progress.trialsPerSecond)} trials/s` : ""}
          </span>
        </Row>
      ) : null}
      {r ? (
        <>
          <Row label="Engine">
            <span className="font-mono">{r.engine}</span>
          </Row>
          <Row label="Method">
            Yield interval: Wilson score, 95 %. Percentiles: {r.percentileStore.method} (≤{" "}
            {formatNumber(r.percentileStore.maxRelativeBucketWidth * 100, 2)} % bucket width).
          </Row>
        </>
      ) : null}
      <Row label="Started by">{study.createdByName ?? "—"}</Row>
    </dl>
  );
}

function Row({ label, children }: { label: string; children: ReactNode }) {
  return (
    <>
      <dt className="text-ink/55">{label}</dt>
      <dd className="min-w-0 text-ink">{children}</dd>
    </>
  );
}
