/** A titled section of the selected element's form, and the helper type that builds tolerance slots. */
import type { ReactNode } from "react";
import type { ToleranceFields } from "./tolerance-controls";

export function Section({ title, aside, children }: { title: string; aside?: ReactNode; children: ReactNode }) {
  return (
    <section className="border-t border-line/80 px-3.5 pt-2.5 pb-3 first:border-t-0">
      <div className="mb-1.5 flex items-baseline justify-between gap-2">
        <h3 className="text-[10.5px] font-bold tracking-[0.08em] text-ink/50 uppercase">{title}</h3>
        {aside ? <span className="text-[11px] text-ink/45">{aside}</span> : null}
      </div>
      {children}
    </section>
  );
}

/** Builds the props of one tolerance slot of the element (see ElementForm). */
export type TolProps = (
  field: string,
  slotPath: (string | number)[],
  label: string,
  unit: "um" | "deg",
  suffix: string,
  inherited?: string,
) => Parameters<typeof ToleranceFields>[0];
