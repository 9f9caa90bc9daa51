/**
 * Every tolerance source of the stack in one table, edited in place: the same values as
 * the element form, so an edit here shows there and in the estimate at once.
 */
import { useMemo, useState } from "react";
import { cn } from "@frontend/lib/cn";
import { sentence } from "@frontend/lib/form";
import { errorsUnder, fieldError } from "../lib/issues";
import { KIND_COLOR, STAGE_LABEL } from "../lib/kinds";
import { formatPath } from "@shared/schemas/stack-file";
import {
  filterRows,
  elementStage,
  sigmaOf,
  sortRows,
  toleranceRows,
  type SortDir,
  type SortKey,
  type ToleranceRow,
} from "../lib/tolerance-rows";
import { useEditor } from "./editor-context";
import { NumberInput, SelectInput, TextInput } from "./fields";
import { DistSelect, OwnerPicker, StageSelect, typicalText, withDist } from "./tolerance-controls";
import { typicalForSlot } from "@shared/typical-tolerances";
import { formatNumber, unitText } from "@shared/format";

const COLUMNS: { key: SortKey; label: string; align?: "right"; className?: string }[] = [
  { key: "element", label: "Element", className: "w-[8%]" },
  { key: "source", label: "Source", className: "w-[17%]" },
  { key: "dist", label: "Distribution", className: "w-[9.5%]" },
  { key: "tol", label: "± Tolerance", align: "right", className: "w-[9%]" },
  { key: "sigmas", label: "Sigmas", align: "right", className: "w-[6.5%]" },
  { key: "mean", label: "Mean shift", align: "right", className: "w-[8.5%]" },
  { key: "sigma", label: "1 σ", align: "right", className: "w-[7.5%]" },
  { key: "stage", label: "Stage", className: "w-[14%]" },
  { key: "owner", label: "Owner", className: "w-[20%]" },
];

export function ToleranceTable() {
  const { doc, select, selectedId } = useEditor();
  const all = useMemo(() => toleranceRows(doc.stack), [doc.stack]);
  const [text, setText] = useState("");
  const [stage, setStage] = useState("");
  const [owner, setOwner] = useState("*");
  const [sort, setSort] = useState<{ key: SortKey; dir: SortDir }>({ key: "element", dir: "asc" });
  const rows = useMemo(() => sortRows(filterRows(all, { text, stage, owner }), sort.key, sort.dir), [all, text, stage, owner, sort]);
  const owners = useMemo(
    () => [...new Set(all.map((r) => r.tol.owner ?? ""))].sort((a, b) => (a === "" ? 1 : b === "" ? -1 : a.localeCompare(b))),
    [all],
  );
  const noOwner = all.filter((r) => !r.tol.owner).length;

  return (
    <div>
      <div className="flex flex-wrap items-center gap-2 border-b border-line px-3 py-2">
        <div className="w-64">
          <TextInput
            type="search"
            aria-label="Filter tolerance sources"
            placeholder="Filter: source, element, owner…"
            value={text}
            onChange={(e) => setText(e.target.value)}
          />
        </div>
        <div className="w-36">
          <SelectInput aria-label="Stage filter" value={stage} onChange={(e) => setStage(e.target.value)}>
            <option value="">Every stage</option>
            {["die", "package", "board", "product"].map((s) => (
              <option key={s} value={s}>
                {STAGE_LABEL[s]} stage
              </option>
            ))}
          </SelectInput>
        </div>
        <div className="w-56">
          <SelectInput aria-label="Owner filter" value={owner} onChange={(e) => setOwner(e.target.value)}>
            <option value="*">Every owner</option>
            {owners.map((o) => (
              <option key={o || "(none)"} value={o}>
                {o || "No owner yet"}
              </option>
            ))}
          </SelectInput>
        </div>
        <span className="ml-auto text-[11px] text-ink/50 tabular-nums">
          {rows.length === all.length ? `${all.length} sources` : `${rows.length} of ${all.length} sources`}
          {noOwner ? <span className="ml-2 font-semibold text-[#a1461f]">{noOwner} without an owner</span> : null}
        </span>
      </div>
      <div className="overflow-x-auto">
        <table className="w-full min-w-[980px] table-fixed border-collapse text-xs" aria-label="Tolerance sources">
          <thead className="border-b border-line bg-paper/70">
            <tr>
              {COLUMNS.map((c) => {
                const active = sort.key === c.key;
                return (
                  <th
                    key={c.key}
                    scope="col"
                    aria-sort={active ? (sort.dir === "asc" ? "ascending" : "descending") : "none"}
                    className={cn(
                      "h-8 px-2 text-[10.5px] font-bold tracking-[0.06em] whitespace-nowrap text-ink/55 uppercase",
                      c.align === "right" ? "text-right" : "text-left",
                      c.className,
                    )}
                  >
                    <button
                      type="button"
                      onClick={() => setSort((s) => ({ key: c.key, dir: s.key === c.key && s.dir === "asc" ? "desc" : "asc" }))}
                      className={cn("inline-flex items-center gap-1 uppercase hover:text-ink", active && "text-ink")}
                    >
                      {c.label}
                      <span aria-hidden="true" className={cn("text-[9px]", active ? "opacity-100" : "opacity-0")}>
                        {sort.dir === "asc" ? "▲" : "▼"}
                      </span>
                    </button>
                  </th>
                );
              })}
            </tr>
          </thead>
          <tbody>
            {rows.length === 0 ? (
              <tr>
                <td colSpan={COLUMNS.length} className="px-3 py-6 text-center text-[13px] text-ink/55">
                  {all.length === 0
                    ? "No tolerances yet. Select an element and add its bond line, tilts, placement, bow or axis alignment."
                    : "No source matches the filter."}
                </td>
              </tr>
            ) : (
              rows.map((r) => (
                <Row key={r.sourceId + r.elementIndex} row={r} selected={r.elementId === selectedId} onSelect={() => select(r.elementId)} />
              ))
            )}
          </tbody>
        </table>
      </div>
    </div>
  );
}

function Row({ row: r, selected, onSelect }: { row: ToleranceRow; selected: boolean; onSelect: () => void }) {
  const { doc, issues, readOnly, setAt, suppliers } = useEditor();
  const el = doc.stack.elements[r.elementIndex];
  const inherited = r.path[0] === "axisTol" ? "die" : elementStage(el);
  const path = ["stack", "elements", r.elementIndex, ...r.path];
  const field = formatPath(r.path as (string | number)[]);
  const list = issues.elements.get(r.elementIndex);
  const err = (sub: string) => fieldError(list, `${field}.${sub}`);
  const all = errorsUnder(list, field);
  const u = unitText(r.unit);
  const key = path.join(".");
  const name = r.sourceId;
  const parentKind = el.parent === null ? undefined : doc.stack.elements.find((e) => e.id === el.parent)?.kind;
  // what is usual for this place, under the value (the element form offers "Use typical")
  const typical = typicalForSlot(el, r.path, parentKind);
  return (
    <>
      <tr
        className={cn(
          "border-b border-line/60 align-middle",
          selected ? "bg-gyro/[0.04]" : "hover:bg-paper/60",
          all.length > 0 && "bg-fail/[0.03]",
        )}
      >
        <td className="px-2 py-1">
          <button
            type="button"
            onClick={onSelect}
            className="inline-flex max-w-full items-center gap-1.5 font-semibold text-ink hover:underline"
            title={`Select ${r.elementId}`}
          >
            <span
              className="size-2.5 shrink-0 rounded-[2px] ring-1 ring-black/10"
              style={{ background: KIND_COLOR[r.elementKind] }}
              aria-hidden="true"
            />
            <span className="truncate">{r.elementId}</span>
          </button>
        </td>
        <td className="px-2 py-1">
          <div className="truncate font-semibold text-ink/85">{r.label}</div>
          <div className="truncate font-mono text-[10.5px] text-ink/45">
            {r.sourceId}
            {r.draws > 1 ? ` · ${r.draws} draws` : ""}
          </div>
        </td>
        <td className="px-2 py-1">
          <DistSelect
            label={`${name} distribution`}
            value={r.tol.dist}
            values={r.tol.values?.length}
            disabled={readOnly}
            invalid={!!err("dist")}
            onChange={(d) => setAt(path, withDist(r.tol, d, typical?.tol))}
          />
        </td>
        <td className="px-2 py-1">
          {r.tol.dist === "data" ? (
            <span className="block text-right text-ink/45">data</span>
          ) : (
            <NumberInput
              aria-label={`${name} tolerance`}
              unit={u}
              value={r.tol.tol}
              disabled={readOnly}
              invalid={!!err("tol")}
              onChange={(v) => setAt([...path, "tol"], v, `${key}.tol`)}
            />
          )}
          {typical ? (
            <span
              className="mt-0.5 block text-right text-[10px] leading-3 text-ink/45"
              title={`${typical.label}: ${typical.note} (${typical.basis})`}
            >
              {typicalText(typical)}
            </span>
          ) : null}
        </td>
        <td className="px-2 py-1">
          {r.tol.dist === "normal" ? (
            <NumberInput
              aria-label={`${name} sigmas`}
              unit="σ"
              size="sm"
              placeholder="3"
              value={r.tol.sigmas}
              disabled={readOnly}
              invalid={!!err("sigmas")}
              onChange={(v) => setAt([...path, "sigmas"], v, `${key}.sigmas`)}
            />
          ) : (
            <span className="block text-right text-ink/35">—</span>
          )}
        </td>
        <td className="px-2 py-1">
          <NumberInput
            aria-label={`${name} mean shift`}
            unit={u}
            placeholder="0"
            value={r.tol.mean}
            disabled={readOnly}
            invalid={!!err("mean")}
            onChange={(v) => setAt([...path, "mean"], v, `${key}.mean`)}
          />
        </td>
        <td className="num px-2 py-1 text-ink/60">
          {formatNumber(sigmaOf(r.tol))}
          <span className="ml-0.5 text-ink/40">{u}</span>
        </td>
        <td className="px-2 py-1">
          <StageSelect
            label={`${name} stage`}
            value={r.tol.stage}
            inherited={inherited}
            disabled={readOnly}
            invalid={!!err("stage")}
            onChange={(s) => setAt([...path, "stage"], s)}
          />
        </td>
        <td className="px-2 py-1">
          <OwnerPicker
            label={`${name} owner`}
            value={r.tol.owner}
            suppliers={suppliers}
            disabled={readOnly}
            onChange={(o) => setAt([...path, "owner"], o, `${key}.owner`)}
          />
        </td>
      </tr>
      {all.length ? (
        <tr className="border-b border-line/60 bg-fail/[0.03]">
          <td />
          <td colSpan={COLUMNS.length - 1} className="px-2 pb-1.5 text-[11px] font-medium text-fail">
            {all.map((i) => sentence(i.message)).join(" · ")}
          </td>
        </tr>
      ) : null}
    </>
  );
}
