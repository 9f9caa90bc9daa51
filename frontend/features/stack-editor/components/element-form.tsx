/**
 * The form of the selected element: identity, geometry (mm), nominal placement (mm, °),
 * bond line (µm) and its supports, direct tilts, placement tolerances, bow and, for a
 * sensor die, the sensing-axis alignment. Every field shows its unit and the message the
 * stack file's validator gives for its path.
 */
import { useEffect, useState, type ReactNode } from "react";
import { ELEMENT_KINDS, isSensorKind, type ElementKind, type StackElement, type Tolerance } from "@shared/schemas/stack-file";
import { IconButton } from "@frontend/components/ui/button";
import { PlusIcon, TrashIcon } from "@frontend/components/ui/icons";
import { cn } from "@frontend/lib/cn";
import { sentence } from "@frontend/lib/form";
import { fieldError, type LocalIssue } from "../lib/issues";
import { KIND_COLOR, KIND_NAME, STAGE_LABEL } from "../lib/kinds";
import { renameElement } from "../lib/stack-ops";
import { AXIS_ANGLE_LABELS, elementStage } from "../lib/tolerance-rows";
import { useEditor } from "./editor-context";
import { FieldShell, NumberField, NumberInput, SelectInput, TextInput } from "./fields";
import { NEW_TOLERANCE, ToleranceFields } from "./tolerance-controls";

function Section({ title, aside, children }: { title: string; aside?: ReactNode; children: ReactNode }) {
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

export function ElementForm({ index }: { index: number }) {
  const { doc, issues, readOnly } = useEditor();
  const el = doc.stack.elements[index];
  if (!el) return null;
  const list = issues.elements.get(index);
  const isBoard = el.parent === null;
  const sensor = isSensorKind(el.kind);
  const stage = elementStage(el);
  const base = ["stack", "elements", index] as const;
  const tolProps = (
    field: string,
    slotPath: (string | number)[],
    label: string,
    unit: "um" | "deg",
    suffix: string,
    inherited = stage,
  ) => ({
    label,
    path: [...base, ...slotPath],
    field,
    tol: slotPath.reduce<unknown>((o, k) => (o && typeof o === "object" ? (o as Record<string, unknown>)[k as string] : undefined), el) as
      Tolerance | undefined,
    unit,
    inheritedStage: inherited,
    issues: list,
    sourceId: `${el.id}.${suffix}`,
  });
  const own = (list ?? []).filter((i) => i.field === "");

  return (
    <div aria-label={`Element ${el.id}`} role="group" className="text-ink">
      <div className="flex items-center gap-2 border-b border-line px-3.5 py-2.5">
        <span className="size-3 shrink-0 rounded-[3px] ring-1 ring-ink/10" style={{ background: KIND_COLOR[el.kind] }} aria-hidden="true" />
        <h2 className="truncate text-[13px] font-extrabold">{el.id || <span className="text-ink/40">(no id)</span>}</h2>
        <span className="text-xs text-ink/50">{KIND_NAME[el.kind] ?? el.kind}</span>
        {readOnly ? <span className="ml-auto text-[11px] font-semibold text-ink/45">Read only</span> : null}
      </div>
      {own.map((i) => (
        <p key={i.message} className="mx-3.5 mt-2 rounded border border-fail/25 bg-fail/[0.05] px-2 py-1 text-[11px] font-medium text-fail">
          {sentence(i.message)}
        </p>
      ))}
      <IdentitySection index={index} el={el} list={list} />
      <Section title="Geometry" aside="mm">
        <div className="grid grid-cols-3 gap-2">
          <GeometryField index={index} axis="x" label="Length x" list={list} />
          <GeometryField index={index} axis="y" label="Width y" list={list} />
          <GeometryField index={index} axis="z" label="Thickness z" list={list} />
        </div>
      </Section>
      {isBoard ? null : <PlacementSection index={index} el={el} list={list} />}
      {isBoard ? null : <BondLineSection index={index} el={el} list={list} tolProps={tolProps} />}
      {isBoard ? null : (
        <Section title="Direct tilts" aside="as angles, when not from heights">
          <div className="grid gap-1.5">
            <ToleranceFields {...tolProps("tiltTol.x", ["tiltTol", "x"], "Tilt about x", "deg", "tiltX")} />
            <ToleranceFields {...tolProps("tiltTol.y", ["tiltTol", "y"], "Tilt about y", "deg", "tiltY")} />
          </div>
        </Section>
      )}
      {isBoard ? null : (
        <Section title="Placement tolerances" aside="offsets move, rotation turns">
          <div className="grid gap-1.5">
            <ToleranceFields {...tolProps("placementTol.yawDeg", ["placementTol", "yawDeg"], "Placement rotation", "deg", "yaw")} />
            <ToleranceFields {...tolProps("placementTol.xUm", ["placementTol", "xUm"], "Offset x", "um", "x")} />
            <ToleranceFields {...tolProps("placementTol.yUm", ["placementTol", "yUm"], "Offset y", "um", "y")} />
          </div>
        </Section>
      )}
      <Section title="Bow" aside="centre above corners; negative is a bowl">
        <ToleranceFields {...tolProps("bowUm", ["bowUm"], "Bow", "um", "bow")} />
      </Section>
      {sensor ? <AxisSection index={index} el={el} list={list} tolProps={tolProps} /> : null}
    </div>
  );
}

type TolProps = (
  field: string,
  slotPath: (string | number)[],
  label: string,
  unit: "um" | "deg",
  suffix: string,
  inherited?: string,
) => Parameters<typeof ToleranceFields>[0];

function IdentitySection({ index, el, list }: { index: number; el: StackElement; list: LocalIssue[] | undefined }) {
  const { update, setAt, readOnly, select, doc } = useEditor();
  const isBoard = el.parent === null;
  // The id is a key of the tree and of metric names: it is applied when it is complete.
  const [idText, setIdText] = useState(el.id);
  useEffect(() => setIdText(el.id), [el.id]);
  const taken = doc.stack.elements.some((e, i) => i !== index && e.id === idText);
  const idLocal =
    idText === ""
      ? "the id cannot be empty"
      : taken
        ? `another element already has the id "${idText}"`
        : !/^[A-Za-z0-9_-]+$/.test(idText)
          ? "an id may hold letters, digits, - and _ only"
          : null;
  const applyId = () => {
    if (idLocal || idText === el.id) return;
    const from = el.id;
    update((d) => renameElement(d, from, idText), `rename:${index}`);
    select(idText);
  };
  return (
    <Section title="Element">
      <div className="grid grid-cols-2 gap-2">
        <FieldShell label="Id" error={idLocal ?? fieldError(list, "id")} hint="names metrics, e.g. mag.tiltDeg">
          {({ id, describedBy, invalid }) => (
            <TextInput
              id={id}
              aria-describedby={describedBy}
              invalid={invalid}
              value={idText}
              disabled={readOnly}
              maxLength={64}
              className="font-mono"
              onChange={(e) => setIdText(e.target.value)}
              onBlur={applyId}
              onKeyDown={(e) => {
                if (e.key === "Enter") applyId();
                if (e.key === "Escape") setIdText(el.id);
              }}
            />
          )}
        </FieldShell>
        <FieldShell label="Kind" error={fieldError(list, "kind")}>
          {({ id, invalid }) => (
            <SelectInput
              id={id}
              invalid={invalid}
              value={el.kind}
              disabled={readOnly || isBoard}
              onChange={(e) => {
                const kind = e.target.value as ElementKind;
                update((d) => {
                  const elements = [...d.stack.elements];
                  const next: StackElement = { ...elements[index], kind };
                  // sensing-axis alignment belongs to sensor dies only
                  if (!isSensorKind(kind)) delete next.axisTol;
                  elements[index] = next;
                  return { ...d, stack: { ...d.stack, elements } };
                });
              }}
            >
              {ELEMENT_KINDS.filter((k) => (isBoard ? k === "board" : k !== "board")).map((k) => (
                <option key={k} value={k}>
                  {KIND_NAME[k]}
                </option>
              ))}
            </SelectInput>
          )}
        </FieldShell>
      </div>
      <div className="mt-2 grid grid-cols-[1fr_1.6fr] gap-2">
        <FieldShell label="Stage" error={fieldError(list, "stage")}>
          {({ id, describedBy, invalid }) => (
            <SelectInput
              id={id}
              aria-describedby={describedBy}
              invalid={invalid}
              value={el.stage ?? ""}
              disabled={readOnly}
              onChange={(e) => setAt(["stack", "elements", index, "stage"], e.target.value || undefined)}
            >
              <option value="">{isBoard ? "Board" : "Package"} (default)</option>
              {(["package", "board", "product"] as const).map((s) => (
                <option key={s} value={s}>
                  {STAGE_LABEL[s]}
                </option>
              ))}
            </SelectInput>
          )}
        </FieldShell>
        <FieldShell label="Name" error={fieldError(list, "name")}>
          {({ id, invalid }) => (
            <TextInput
              id={id}
              invalid={invalid}
              value={el.name ?? ""}
              placeholder={isBoard ? "e.g. Main board, 8-layer FR-4" : "e.g. 3-axis magnetometer die, rev B"}
              disabled={readOnly}
              maxLength={200}
              onChange={(e) =>
                setAt(["stack", "elements", index, "name"], e.target.value === "" ? undefined : e.target.value, `name:${index}`)
              }
            />
          )}
        </FieldShell>
      </div>
    </Section>
  );
}

function GeometryField({
  index,
  axis,
  label,
  list,
}: {
  index: number;
  axis: "x" | "y" | "z";
  label: string;
  list: LocalIssue[] | undefined;
}) {
  const { doc, setAt, readOnly } = useEditor();
  const el = doc.stack.elements[index];
  return (
    <NumberField
      label={label}
      unit="mm"
      value={el.size?.[axis]}
      disabled={readOnly}
      error={fieldError(list, `size.${axis}`) ?? (axis === "x" ? fieldError(list, "size") : undefined)}
      onChange={(v) => setAt(["stack", "elements", index, "size", axis], v)}
    />
  );
}

function PlacementSection({ index, el, list }: { index: number; el: StackElement; list: LocalIssue[] | undefined }) {
  const { setAt, readOnly } = useEditor();
  const posErr = fieldError(list, "position");
  return (
    <Section title="Nominal placement" aside={`centre of the bottom face on ${el.parent}`}>
      <div className="grid grid-cols-3 gap-2">
        <NumberField
          label="Position x"
          unit="mm"
          placeholder="0"
          value={el.position?.x}
          disabled={readOnly}
          error={fieldError(list, "position.x")}
          onChange={(v) =>
            setAt(
              ["stack", "elements", index, "position"],
              v === undefined && el.position?.y === undefined ? undefined : { x: v ?? 0, y: el.position?.y ?? 0 },
            )
          }
        />
        <NumberField
          label="Position y"
          unit="mm"
          placeholder="0"
          value={el.position?.y}
          disabled={readOnly}
          error={fieldError(list, "position.y")}
          onChange={(v) =>
            setAt(
              ["stack", "elements", index, "position"],
              v === undefined && el.position?.x === undefined ? undefined : { x: el.position?.x ?? 0, y: v ?? 0 },
            )
          }
        />
        <NumberField
          label="Nominal yaw"
          unit="°"
          placeholder="0"
          value={el.yawDeg}
          disabled={readOnly}
          error={fieldError(list, "yawDeg")}
          onChange={(v) => setAt(["stack", "elements", index, "yawDeg"], v)}
        />
      </div>
      {posErr ? <p className="mt-1 text-[11px] font-medium text-fail">{sentence(posErr)}</p> : null}
    </Section>
  );
}

function BondLineSection({
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

function AxisSection({
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
                const one: Tolerance = (cur && !Array.isArray(cur) ? cur : NEW_TOLERANCE) as Tolerance;
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
