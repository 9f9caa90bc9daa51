/** The bond line of the selected element: thickness, support points (corners or a list) and the height tolerance. */
import type { StackElement } from "@shared/schemas/stack-file";
import { IconButton } from "@frontend/components/ui/button";
import { PlusIcon, TrashIcon } from "@frontend/components/ui/icons";
import { sentence } from "@frontend/lib/form";
import { fieldError, type LocalIssue } from "../lib/issues";
import { useEditor } from "./editor-context";
import { FieldShell, NumberField, NumberInput, SelectInput } from "./fields";
import { Section, type TolProps } from "./form-section";
import { ToleranceFields } from "./tolerance-controls";

export function BondLineSection({
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
  const supports = el.bondLine?.supports;
  const points = Array.isArray(supports) ? supports : null;
  const path = ["stack", "elements", index, "bondLine", "supports"];
  const hx = (el.size?.x ?? 0) / 2,
    hy = (el.size?.y ?? 0) / 2;
  const supportsErr = fieldError(list, "bondLine.supports");
  return (
    <Section title="Bond line" aside="support heights give the tilt">
      <div className="mb-2 grid grid-cols-[1fr_2fr] gap-2">
        <NumberField
          label="Thickness"
          unit="µm"
          placeholder="—"
          value={el.bondLine?.thicknessUm}
          disabled={readOnly}
          error={fieldError(list, "bondLine.thicknessUm")}
          onChange={(v) => setAt(["stack", "elements", index, "bondLine", "thicknessUm"], v)}
        />
        <FieldShell label="Supports" error={supportsErr}>
          {({ id, invalid }) => (
            <SelectInput
              id={id}
              invalid={invalid}
              value={points ? "points" : "corners"}
              disabled={readOnly}
              onChange={(e) =>
                setAt(
                  path,
                  e.target.value === "corners"
                    ? undefined
                    : [
                        { x: -round2(hx * 0.8), y: -round2(hy * 0.8) },
                        { x: round2(hx * 0.8), y: -round2(hy * 0.8) },
                        { x: 0, y: round2(hy * 0.9) },
                      ],
                )
              }
            >
              <option value="corners">Four corners of the footprint</option>
              <option value="points">Listed points (element frame)</option>
            </SelectInput>
          )}
        </FieldShell>
      </div>
      {points ? (
        <div className="mb-2 rounded-md border border-line">
          <table className="w-full text-xs" aria-label={`Support points of ${el.id}`}>
            <thead>
              <tr className="border-b border-line bg-paper/70 text-[10.5px] font-bold tracking-[0.06em] text-ink/50 uppercase">
                <th className="w-8 px-2 py-1 text-left">#</th>
                <th className="px-1 py-1 text-right">x (mm)</th>
                <th className="px-1 py-1 text-right">y (mm)</th>
                <th className="w-8" />
              </tr>
            </thead>
            <tbody>
              {points.map((p, j) => {
                const err =
                  fieldError(list, `bondLine.supports[${j}]`) ??
                  fieldError(list, `bondLine.supports[${j}].x`) ??
                  fieldError(list, `bondLine.supports[${j}].y`);
                return (
                  <tr key={j} className="border-b border-line/60 align-top last:border-b-0">
                    <td className="num px-2 py-1 text-left text-ink/50">{j + 1}</td>
                    <td className="px-1 py-1">
                      <NumberInput
                        aria-label={`Support ${j + 1} x`}
                        unit="mm"
                        value={p.x}
                        invalid={!!err}
                        disabled={readOnly}
                        onChange={(v) => setAt([...path, j, "x"], v)}
                      />
                    </td>
                    <td className="px-1 py-1">
                      <NumberInput
                        aria-label={`Support ${j + 1} y`}
                        unit="mm"
                        value={p.y}
                        invalid={!!err}
                        disabled={readOnly}
                        onChange={(v) => setAt([...path, j, "y"], v)}
                      />
                      {err ? <p className="mt-0.5 text-[11px] leading-4 text-fail">{sentence(err)}</p> : null}
                    </td>
                    <td className="px-1 py-1 text-right">
                      {readOnly ? null : (
                        <IconButton
                          label={`Remove support ${j + 1}`}
                          variant="danger-ghost"
                          className="size-6"
                          onClick={() =>
                            setAt(
                              path,
                              points.filter((_, k) => k !== j),
                            )
                          }
                        >
                          <TrashIcon size={12} />
                        </IconButton>
                      )}
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
          {readOnly ? null : (
            <button
              type="button"
              onClick={() => setAt(path, [...points, { x: 0, y: 0 }])}
              className="flex h-7 w-full items-center justify-center gap-1 border-t border-line text-[11px] font-semibold text-gyro hover:bg-gyro/[0.05]"
            >
              <PlusIcon size={12} /> Add support point
            </button>
          )}
        </div>
      ) : null}
      <ToleranceFields {...tolProps("bondLine.heightTol", ["bondLine", "heightTol"], "Height of each support", "um", "bondLine")} />
    </Section>
  );
}

const round2 = (v: number) => Math.round(v * 100) / 100;
