import type { ReactNode } from "react";
import type { ReportContent } from "@shared/schemas/reports";
import { Panel } from "@frontend/components/ui/panel";
import { formatCount } from "@shared/format";

/** What the study assumed (field, calibration, trials, sweep) and the engineer's note. */
export function ReportAssumptions({ content: c, note }: { content: ReportContent; note: string }) {
  return (
    <Panel title="Assumptions of the study" accent="var(--color-asic)">
      <dl className="grid gap-x-6 gap-y-2 text-[13px] sm:grid-cols-2">
        <Item label="Field inclination">
          {c.study.inclinationDeg.toFixed(2)}°
          {c.study.site
            ? ` (${c.study.site.model}, ${c.study.site.latitudeDeg}°, ${c.study.site.longitudeDeg}°, ${c.study.site.date})`
            : ", as entered"}
        </Item>
        <Item label="Calibration">
          {c.study.calibration.after === "none"
            ? "none"
            : `after ${c.study.calibration.after}, residual ${c.study.calibration.residual ?? "none"}`}
        </Item>
        <Item label="Trials and seed">
          {formatCount(c.study.trials)} trials, seed {c.study.seed}
        </Item>
        <Item label="Heading sweep">
          every {c.study.headingStepDeg}° at {c.study.tilts.length} tilt{c.study.tilts.length === 1 ? "" : "s"}
        </Item>
        {note ? <Item label="Note from the engineer">{note}</Item> : null}
      </dl>
    </Panel>
  );
}

/** The report's cautions, always shown in full. */
export function ReportCautions({ cautions }: { cautions: string[] }) {
  return (
    <div className="rounded-lg border border-fail/25 bg-fail/[0.04] px-4 py-3 text-[13px] text-ink/80" role="note" aria-label="Cautions">
      <p className="mb-1 text-2xs font-extrabold tracking-[0.08em] text-fail uppercase">Read before use</p>
      {cautions.map((t) => (
        <p key={t}>{t}</p>
      ))}
    </div>
  );
}

function Item({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div>
      <dt className="text-xs font-semibold text-ink/50">{label}</dt>
      <dd className="text-ink/85">{children}</dd>
    </div>
  );
}
