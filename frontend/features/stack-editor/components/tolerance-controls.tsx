/**
 * The parts of one tolerance (MODEL.md section 8) as controls, shared by the element
 * form and the table of tolerance sources: distribution, ± half-width, sigmas, mean
 * shift, stage and owner.
 */
import { useEffect, useState } from "react";
import type { Tolerance } from "@shared/schemas/stack-file";
import { IconButton } from "@frontend/components/ui/button";
import { CloseIcon, PlusIcon } from "@frontend/components/ui/icons";
import { cn } from "@frontend/lib/cn";
import { sentence } from "@frontend/lib/form";
import { errorsUnder, fieldError, type LocalIssue } from "../lib/issues";
import { STAGE_LABEL } from "../lib/kinds";
import type { Path } from "../lib/stack-ops";
import { sigmaOf, type ToleranceUnit } from "../lib/tolerance-rows";
import { useEditor } from "./editor-context";
import { FieldShell, NumberInput, SelectInput, TextInput } from "./fields";
import { formatNumber, formatPlain, unitText } from "@shared/format";
import { toleranceFrom, type TypicalTolerance } from "@shared/typical-tolerances";

export const DIST_LABEL: Record<Tolerance["dist"], string> = {
  normal: "Normal",
  uniform: "Uniform",
  triangular: "Triangular",
  data: "Measured data",
};

/**
 * Changing the distribution keeps the half-width; sigmas belongs to "normal" only. Measured
 * data may have no half-width: the typical one of the place, if known, rather than ±0.
 */
export function withDist(t: Tolerance, dist: Tolerance["dist"], typicalTol?: number): Tolerance {
  if (dist === t.dist) return t;
  const { sigmas: _s, values: _v, ...rest } = t;
  void _s;
  void _v;
  return { ...rest, dist, tol: t.tol ?? typicalTol ?? 0 };
}

export function DistSelect({
  value,
  onChange,
  disabled,
  id,
  label,
  invalid,
  values,
}: {
  value: Tolerance["dist"];
  onChange: (d: Tolerance["dist"]) => void;
  disabled?: boolean;
  id?: string;
  label?: string;
  invalid?: boolean;
  values?: number;
}) {
  return (
    <SelectInput
      id={id}
      aria-label={label}
      value={value}
      disabled={disabled}
      invalid={invalid}
      onChange={(e) => onChange(e.target.value as Tolerance["dist"])}
    >
      <option value="normal">Normal</option>
      <option value="uniform">Uniform</option>
      <option value="triangular">Triangular</option>
      {value === "data" ? <option value="data">Measured ({values ?? 0} values)</option> : null}
    </SelectInput>
  );
}

export function StageSelect({
  value,
  inherited,
  onChange,
  disabled,
  id,
  label,
  invalid,
}: {
  value: string | undefined;
  inherited: string;
  onChange: (s: Tolerance["stage"]) => void;
  disabled?: boolean;
  id?: string;
  label?: string;
  invalid?: boolean;
}) {
  return (
    <SelectInput
      id={id}
      aria-label={label}
      value={value ?? ""}
      disabled={disabled}
      invalid={invalid}
      onChange={(e) => onChange((e.target.value || undefined) as Tolerance["stage"])}
    >
      <option value="">{STAGE_LABEL[inherited] ?? inherited} (element)</option>
      {(["die", "package", "board", "product"] as const).map((s) => (
        <option key={s} value={s}>
          {STAGE_LABEL[s]}
        </option>
      ))}
    </SelectInput>
  );
}

const OTHER = "\u0000other";

/**
 * The owner: one of the workspace's supplier companies (its name goes into the file's
 * `owner`), or free text for an in-house process step.
 */
export function OwnerPicker({
  value,
  onChange,
  suppliers,
  disabled,
  label = "Owner",
  id,
  className,
}: {
  value: string | undefined;
  onChange: (owner: string | undefined) => void;
  suppliers: string[];
  disabled?: boolean;
  label?: string;
  id?: string;
  className?: string;
}) {
  const isSupplier = value !== undefined && suppliers.includes(value);
  const [other, setOther] = useState(value !== undefined && !isSupplier);
  useEffect(() => {
    if (value !== undefined) setOther(!suppliers.includes(value));
  }, [value, suppliers]);
  const selectValue = other ? OTHER : (value ?? "");
  return (
    <div className={cn("flex min-w-0 gap-1", className)}>
      <SelectInput
        id={id}
        aria-label={label}
        value={selectValue}
        disabled={disabled}
        className={other ? "w-[40%] shrink-0" : "w-full"}
        onChange={(e) => {
          const v = e.target.value;
          if (v === OTHER) {
            setOther(true);
            if (value !== undefined && suppliers.includes(value)) onChange(undefined);
          } else {
            setOther(false);
            onChange(v || undefined);
          }
        }}
      >
        <option value="">No owner yet</option>
        {suppliers.length ? (
          <optgroup label="Supplier companies">
            {suppliers.map((s) => (
              <option key={s} value={s}>
                {s}
              </option>
            ))}
          </optgroup>
        ) : null}
        <option value={OTHER}>{other ? "In-house:" : "In-house / other…"}</option>
      </SelectInput>
      {other ? (
        <TextInput
          aria-label={`${label}: in-house step`}
          placeholder="Process step"
          value={value ?? ""}
          maxLength={200}
          disabled={disabled}
          onChange={(e) => onChange(e.target.value === "" ? undefined : e.target.value)}
          className="min-w-40 flex-1 field-sizing-content"
        />
      ) : null}
    </div>
  );
}

/**
 * The start of a new tolerance where no typical value is known (typical-tolerances.ts has
 * one for every slot of the form); the engineer types the real value.
 */
export const NEW_TOLERANCE: Tolerance = { dist: "normal", tol: 0 };

/** "typical ±5 µm (normal)", the hint beside a tolerance. */
export function typicalText(t: TypicalTolerance): string {
  return `typical ±${formatPlain(t.tol)}${t.unit === "deg" ? "°" : ` ${unitText(t.unit)}`}${t.dist === "normal" ? "" : ` (${t.dist})`}`;
}

function TypicalHint({ typical, tol, onUse }: { typical: TypicalTolerance; tol: Tolerance | undefined; onUse?: () => void }) {
  const same = tol !== undefined && tol.dist === typical.dist && tol.tol === typical.tol;
  return (
    <span className="inline-flex items-center gap-1">
      <span className="text-[10.5px] text-ink/50" title={`${typical.label}: ${typical.note} (${typical.basis})`}>
        {typicalText(typical)}
      </span>
      {onUse && tol !== undefined && !same ? (
        <button
          type="button"
          onClick={onUse}
          className="rounded px-1 text-[10.5px] font-semibold text-gyro hover:bg-gyro/[0.07]"
          aria-label={`Use the typical value for ${typical.label.toLowerCase()}`}
        >
          Use typical
        </button>
      ) : null}
    </span>
  );
}

/**
 * One tolerance slot of the element form. Absent means zero (MODEL.md section 9);
 * "Add" creates it, × removes it.
 */
export function ToleranceFields({
  label,
  path,
  field,
  tol,
  unit,
  inheritedStage,
  issues,
  sourceId,
  typical,
}: {
  label: string;
  /** document path of the tolerance */
  path: Path;
  /** field path inside the element, for the validator's messages */
  field: string;
  tol: Tolerance | undefined;
  unit: ToleranceUnit;
  inheritedStage: string;
  issues: LocalIssue[] | undefined;
  sourceId: string;
  /** the typical value of this slot: shown beside it, and where a new tolerance starts */
  typical?: TypicalTolerance;
}) {
  const { setAt, readOnly, suppliers } = useEditor();
  // keeps the stage and owner already chosen; takes the typical distribution and half-width
  const applyTypical = typical
    ? () => {
        const { sigmas: _s, values: _v, rows: _r, mean: _m, ...keep } = tol ?? { dist: typical.dist };
        void [_s, _v, _r, _m];
        setAt(path, { ...keep, ...toleranceFrom(typical) });
      }
    : undefined;
  const u = unitText(unit);
  const key = path.join(".");
  const err = (sub: string) => fieldError(issues, `${field}.${sub}`);
  const placed = new Set([`${field}.tol`, `${field}.sigmas`, `${field}.mean`, `${field}.stage`, `${field}.owner`, `${field}.dist`]);
  const other = errorsUnder(issues, field).filter((i) => !placed.has(i.field));

  if (!tol) {
    return (
      <div className="flex min-h-8 items-center justify-between gap-2 rounded-md border border-dashed border-line px-2.5 py-1">
        <div className="min-w-0">
          <span className="text-xs font-semibold text-ink/70">{label}</span>
          <span className="ml-2 font-mono text-[10.5px] text-ink/40">{sourceId}</span>
          {typical ? (
            <span className="ml-2">
              <TypicalHint typical={typical} tol={undefined} />
            </span>
          ) : null}
        </div>
        {readOnly ? (
          <span className="text-[11px] text-ink/45">None (zero)</span>
        ) : (
          <button
            type="button"
            onClick={() => setAt(path, typical ? toleranceFrom(typical) : NEW_TOLERANCE)}
            className="inline-flex h-6 items-center gap-1 rounded px-1.5 text-[11px] font-semibold text-gyro hover:bg-gyro/[0.07]"
            aria-label={`Add ${label.toLowerCase()} tolerance`}
          >
            <PlusIcon size={12} /> Add tolerance
          </button>
        )}
      </div>
    );
  }
  const sigma = sigmaOf(tol);
  return (
    <fieldset className="rounded-md border border-line bg-paper/40 px-2.5 pt-1.5 pb-2" aria-label={`${label} tolerance`}>
      <legend className="sr-only">{label}</legend>
      <div className="mb-1 flex items-center justify-between gap-2">
        <div className="min-w-0">
          <span className="text-xs font-bold text-ink/80">{label}</span>
          <span className="ml-2 font-mono text-[10.5px] text-ink/40">{sourceId}</span>
        </div>
        <div className="flex items-center gap-1.5">
          {typical ? <TypicalHint typical={typical} tol={tol} onUse={readOnly ? undefined : applyTypical} /> : null}
          <span className="num text-[11px] text-ink/45" title="One standard deviation of this source">
            σ = {formatNumber(sigma)} {u}
          </span>
          {readOnly ? null : (
            <IconButton label={`Remove ${label.toLowerCase()} tolerance`} className="size-6" onClick={() => setAt(path, undefined)}>
              <CloseIcon size={12} />
            </IconButton>
          )}
        </div>
      </div>
      <div className="grid grid-cols-[1.15fr_1fr_0.7fr_1fr] gap-1.5">
        <FieldShell label="Distribution" error={err("dist")}>
          {({ id, invalid }) => (
            <DistSelect
              id={id}
              value={tol.dist}
              invalid={invalid}
              disabled={readOnly}
              values={tol.values?.length}
              onChange={(d) => setAt(path, withDist(tol, d, typical?.tol))}
            />
          )}
        </FieldShell>
        <FieldShell label="± Tolerance" error={err("tol")}>
          {({ id, describedBy, invalid, setLocalError }) =>
            tol.dist === "data" ? (
              <p id={id} className="flex h-7 items-center text-[11px] text-ink/55">
                from the data
              </p>
            ) : (
              <NumberInput
                id={id}
                aria-describedby={describedBy}
                invalid={invalid}
                onLocalError={setLocalError}
                unit={u}
                value={tol.tol}
                disabled={readOnly}
                onChange={(v) => setAt([...path, "tol"], v, `${key}.tol`)}
              />
            )
          }
        </FieldShell>
        <FieldShell label="Sigmas" error={err("sigmas")}>
          {({ id, describedBy, invalid, setLocalError }) =>
            tol.dist === "normal" ? (
              <NumberInput
                id={id}
                aria-describedby={describedBy}
                invalid={invalid}
                onLocalError={setLocalError}
                unit="σ"
                size="sm"
                placeholder="3"
                value={tol.sigmas}
                disabled={readOnly}
                onChange={(v) => setAt([...path, "sigmas"], v, `${key}.sigmas`)}
              />
            ) : (
              <p className="flex h-7 items-center text-[11px] text-ink/40" id={id}>
                —
              </p>
            )
          }
        </FieldShell>
        <FieldShell label="Mean shift" error={err("mean")}>
          {({ id, describedBy, invalid, setLocalError }) => (
            <NumberInput
              id={id}
              aria-describedby={describedBy}
              invalid={invalid}
              onLocalError={setLocalError}
              unit={u}
              placeholder="0"
              value={tol.mean}
              disabled={readOnly}
              onChange={(v) => setAt([...path, "mean"], v, `${key}.mean`)}
            />
          )}
        </FieldShell>
      </div>
      <div className="mt-1.5 grid grid-cols-[1fr_1.6fr] gap-1.5">
        <FieldShell label="Stage" error={err("stage")}>
          {({ id, invalid }) => (
            <StageSelect
              id={id}
              invalid={invalid}
              value={tol.stage}
              inherited={inheritedStage}
              disabled={readOnly}
              onChange={(s) => setAt([...path, "stage"], s)}
            />
          )}
        </FieldShell>
        <FieldShell label="Owner" error={err("owner")}>
          {({ id }) => (
            <OwnerPicker
              id={id}
              value={tol.owner}
              suppliers={suppliers}
              disabled={readOnly}
              onChange={(o) => setAt([...path, "owner"], o, `${key}.owner`)}
            />
          )}
        </FieldShell>
      </div>
      {other.map((i) => (
        <p key={`${i.field}:${i.message}`} className="mt-1 text-[11px] font-medium text-fail">
          {sentence(i.message)}
        </p>
      ))}
    </fieldset>
  );
}
