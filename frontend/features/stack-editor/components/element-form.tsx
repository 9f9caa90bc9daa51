/**
 * The form of the selected element: identity, geometry (mm), nominal placement (mm, °),
 * bond line (µm) and its supports, direct tilts, placement tolerances, bow and, for a
 * sensor die, the sensing-axis alignment. Every field shows its unit and the message the
 * stack file's validator gives for its path.
 */
import type { Tolerance } from "@shared/schemas/stack-file";
import { isSensorKind, type StackElement } from "@shared/schemas/stack-file";
import { BODY_HEIGHT_KEY } from "@shared/stack-geometry";
import { typicalForSlot } from "@shared/typical-tolerances";
import { sentence } from "@frontend/lib/form";
import { fieldError, type LocalIssue } from "../lib/issues";
import { KIND_COLOR, KIND_NAME } from "../lib/kinds";
import { elementStage } from "../lib/tolerance-rows";
import { AxisSection } from "./axis-section";
import { BondLineSection } from "./bond-line-section";
import { useEditor } from "./editor-context";
import { NumberField } from "./fields";
import { Section } from "./form-section";
import { IdentitySection } from "./identity-section";
import { ToleranceFields } from "./tolerance-controls";

export function ElementForm({ index }: { index: number }) {
  const { doc, issues, readOnly, warnings } = useEditor();
  const el = doc.stack.elements[index];
  if (!el) return null;
  const list = issues.elements.get(index);
  const parentKind = el.parent === null ? undefined : doc.stack.elements.find((e) => e.id === el.parent)?.kind;
  const slips = warnings.get(index) ?? [];
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
    typical: typicalForSlot(el, slotPath, parentKind),
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
      {slips.length ? (
        <ul aria-label={`Geometry warnings of ${el.id}`} className="mx-3.5 mt-2 grid gap-1">
          {slips.map((w) => (
            <li key={w.message} className="rounded border border-warn/30 bg-warn/[0.07] px-2 py-1 text-[11px] font-medium text-ink/80">
              <span className="font-bold text-warn">Geometry: </span>
              {sentence(w.message)}
            </li>
          ))}
        </ul>
      ) : null}
      <IdentitySection index={index} el={el} list={list} />
      <Section title="Geometry" aside="mm">
        <div className="grid grid-cols-3 gap-2">
          <GeometryField index={index} axis="x" label="Length x" list={list} />
          <GeometryField index={index} axis="y" label="Width y" list={list} />
          <GeometryField index={index} axis="z" label="Thickness z" list={list} />
        </div>
        {el.kind === "substrate" ? <BodyHeightField index={index} el={el} /> : null}
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

/** A package's body height (substrate bottom to body top), kept in the element's free-form meta. */
function BodyHeightField({ index, el }: { index: number; el: StackElement }) {
  const { setAt, readOnly } = useEditor();
  const v = el.meta?.[BODY_HEIGHT_KEY];
  return (
    <div className="mt-2 grid grid-cols-3 gap-2">
      <NumberField
        label="Package body height"
        unit="mm"
        placeholder="—"
        value={typeof v === "number" ? v : undefined}
        disabled={readOnly}
        onChange={(h) => {
          const { [BODY_HEIGHT_KEY]: _old, ...rest } = el.meta ?? {};
          void _old;
          const meta = h === undefined ? rest : { ...rest, [BODY_HEIGHT_KEY]: h };
          setAt(["stack", "elements", index, "meta"], Object.keys(meta).length ? meta : undefined);
        }}
      />
      <p className="col-span-2 self-end pb-1 text-[11px] text-ink/50">Dies that reach above it are flagged.</p>
    </div>
  );
}
