/** The sensing-axis alignment of a sensor die: one tolerance for the six angles, or six (g1..g6). */
import type { StackElement, Tolerance } from "@shared/schemas/stack-file";
import { toleranceFrom } from "@shared/typical-tolerances";
import { cn } from "@frontend/lib/cn";
import { sentence } from "@frontend/lib/form";
import { fieldError, type LocalIssue } from "../lib/issues";
import { AXIS_ANGLE_LABELS } from "../lib/tolerance-rows";
import { useEditor } from "./editor-context";
import { Section, type TolProps } from "./form-section";
import { NEW_TOLERANCE, ToleranceFields } from "./tolerance-controls";

export function AxisSection({
  index,
  el,
  list,
  tolProps,
}: {
  index: number;
  el: StackElement;
  list: LocalIssue[] | undefined;
  tolProps: TolProps;
}) {
  const { setAt, readOnly } = useEditor();
  const six = Array.isArray(el.axisTol);
  const path = ["stack", "elements", index, "axisTol"];
  const err = fieldError(list, "axisTol");
  return (
    <Section title="Sensing-axis alignment" aside="die stage: from the die maker">
      <div className="mb-2 flex items-center gap-1" role="radiogroup" aria-label="Axis alignment given as">
        {[
          { v: false, label: "One tolerance, six angles" },
          { v: true, label: "Six tolerances, g1 to g6" },
        ].map((o) => (
          <button
            key={o.label}
            type="button"
            role="radio"
            aria-checked={six === o.v}
            disabled={readOnly}
            onClick={() => {
              if (six === o.v) return;
              const cur = el.axisTol;
              if (o.v) {
                const typical = tolProps("axisTol", ["axisTol"], "", "deg", "axis", "die").typical;
                const start = typical ? toleranceFrom(typical) : NEW_TOLERANCE;
                const one: Tolerance = (cur && !Array.isArray(cur) ? cur : start) as Tolerance;
                setAt(
                  path,
                  Array.from({ length: 6 }, () => ({ ...one })),
                );
              } else {
                setAt(path, Array.isArray(cur) ? { ...cur[0] } : cur);
              }
            }}
            className={cn(
              "h-6.5 rounded px-2 text-[11px] font-semibold transition-colors disabled:cursor-default",
              six === o.v ? "bg-ink text-paper" : "text-ink/60 hover:bg-ink/[0.06] hover:text-ink",
            )}
          >
            {o.label}
          </button>
        ))}
      </div>
      {err ? <p className="mb-1 text-[11px] font-medium text-fail">{sentence(err)}</p> : null}
      {six ? (
        <div className="grid gap-1.5">
          {AXIS_ANGLE_LABELS.map((label, k) => (
            <ToleranceFields key={k} {...tolProps(`axisTol[${k}]`, ["axisTol", k], `Angle ${label}`, "deg", `axis.g${k + 1}`, "die")} />
          ))}
        </div>
      ) : (
        <ToleranceFields {...tolProps("axisTol", ["axisTol"], "Axis alignment, each angle", "deg", "axis", "die")} />
      )}
    </Section>
  );
}
