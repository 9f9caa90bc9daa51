import type { ReactNode } from "react";
import type { ReportContent } from "@shared/schemas/reports";
import { cn } from "@frontend/lib/cn";
import { formatIndex } from "@shared/format";

/** Four figures across the top: tolerances held, capability asked, requirements fed and passing. */
export function ReportKeyFacts({ content: c }: { content: ReportContent }) {
  const fed = c.requirements.filter((r) => r.fed).length;
  const passing = c.requirements.filter((r) => r.passes).length;
  return (
    <dl className="mb-5 grid grid-cols-2 gap-px overflow-hidden rounded-lg border border-line bg-line sm:grid-cols-4">
      <Fact label="Tolerances you hold">{c.tolerances.length}</Fact>
      <Fact label="Capability asked">Cpk ≥ {formatIndex(c.capability.cpk)}</Fact>
      <Fact label="Requirements fed">
        {fed} of {c.requirements.length}
      </Fact>
      <Fact label="Predicted to pass" tone={passing === c.requirements.length ? "pass" : "fail"}>
        {passing} of {c.requirements.length}
      </Fact>
    </dl>
  );
}

function Fact({ label, children, tone }: { label: string; children: ReactNode; tone?: "pass" | "fail" }) {
  return (
    <div className="bg-panel px-4 py-3">
      <dt className="text-[10px] font-bold tracking-[0.08em] text-ink/45 uppercase">{label}</dt>
      <dd
        className={cn(
          "mt-1 text-[15px] font-extrabold tabular-nums",
          tone === "pass" ? "text-pass" : tone === "fail" ? "text-fail" : "text-ink",
        )}
      >
        {children}
      </dd>
    </div>
  );
}
