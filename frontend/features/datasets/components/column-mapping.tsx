import { useEffect, useMemo, useRef, useState } from "react";
import type { Dataset, DatasetColumn, MappingInput } from "@shared/schemas/datasets";
import { stackSources, type StackSource } from "@shared/datasets/sources";
import { conversionFactor, MEASURE_UNITS, unitKind, type MeasureUnit } from "@shared/datasets/units";
import { Alert } from "@frontend/components/ui/alert";
import { Badge } from "@frontend/components/ui/badge";
import { Button } from "@frontend/components/ui/button";
import { Input, Select } from "@frontend/components/ui/field";
import { useProjectRevisions, useRevision } from "@frontend/features/studies";
import { isApiError } from "@frontend/lib/api-client";
import { sentence } from "@frontend/lib/form";
import { useUpdateDataset } from "../api/update-dataset";
import { useUpdateMappings } from "../api/update-mappings";
import { formatMeasure, unitText } from "@shared/format";

/** `source` is a source id, or "<id>#<part>" for one column of a pooled source. */
type Row = { source: string; unit: MeasureUnit | ""; nominal: string; nominalEdited?: boolean };

const COMPONENTS = ["x", "y"] as const;

function splitChoice(v: string): { source: string; part: number | null } {
  const i = v.indexOf("#");
  return i < 0 ? { source: v, part: null } : { source: v.slice(0, i), part: Number(v.slice(i + 1)) };
}

/** The body fields that name the part: a bond line's support, a tilt's x/y, an axis angle g1..g6. */
function partFields(source: string, part: number | null): Pick<MappingInput, "support" | "component"> {
  if (part === null) return {};
  if (source.endsWith(".bondLine")) return { support: part };
  if (source.endsWith(".tilt")) return { component: COMPONENTS[part] };
  return { component: `g${part + 1}` as MappingInput["component"] };
}

/** A source offered as one column for all its draws, beside its parts (not the pooled tilt, not six separate axis tolerances). */
const takesOneColumn = (s: StackSource) =>
  !s.parts || s.id.endsWith(".bondLine") || (s.id.endsWith(".axis") && s.parts.every((p) => p.tolerance === s.parts![0].tolerance));

/** The stack's design value of a source (bond-line thickness, position, yaw) in the column's unit: the nominal to take off. */
function stackNominal(src: StackSource | undefined, unit: MeasureUnit | ""): string {
  if (!src || !unit) return "0";
  const f = conversionFactor(unit, src.unit);
  return f ? String(Number((src.nominal / f).toPrecision(8))) : "0";
}

const th = "h-7 px-3 text-2xs font-bold tracking-[0.06em] whitespace-nowrap text-ink/55 uppercase";

function toleranceText(s: StackSource): string {
  const t = s.tolerance;
  const u = unitText(s.unit);
  if (t.dist === "data") return "measured data";
  const mean = t.mean ? `${formatMeasure(t.mean)} ` : "";
  return `${mean}±${formatMeasure(t.tol ?? 0)}${u === "°" ? "°" : ` ${u}`} ${t.dist}`;
}

/**
 * Which tolerance source each measured column stands for, in which unit, around which nominal.
 * Sources come from one stack revision of the project; only those of the column's kind
 * (heights in µm, angles in degrees) are offered.
 */
export function ColumnMapping({ dataset, canWrite, onShow }: { dataset: Dataset; canWrite: boolean; onShow: (column: string) => void }) {
  const revisions = useProjectRevisions(dataset.projectId);
  const numeric = useMemo(() => dataset.columns.filter((c) => c.kind === "number"), [dataset]);
  const mappedRev = numeric.find((c) => c.mapping)?.mapping?.revisionId;
  const list = revisions.data ?? [];
  const defaultRev = mappedRev ?? list.find((r) => r.status === "approved")?.id ?? list[0]?.id ?? "";
  const [revisionId, setRevisionId] = useState("");
  const rev = revisionId || defaultRev;
  const revision = useRevision(rev || null);
  const sources = useMemo(() => (revision.data ? stackSources(revision.data.stack) : []), [revision.data]);

  const initial = useMemo(() => {
    const out: Record<string, Row> = {};
    for (const c of numeric) {
      const m = c.mapping && c.mapping.revisionId === rev ? c.mapping : null;
      out[c.key] = {
        source: m ? (m.part !== null ? `${m.source}#${m.part}` : m.source) : "",
        unit: m?.unit ?? c.unit ?? "",
        nominal: m ? String(m.nominal) : "0",
      };
    }
    return out;
  }, [numeric, rev]);
  const [rows, setRows] = useState(initial);
  // A refresh of the data set (a lot column chosen, a save) keeps the rows edited here and not yet
  // saved; another revision starts from its own mapping.
  const previous = useRef({ initial, rev });
  useEffect(() => {
    const before = previous.current;
    previous.current = { initial, rev };
    if (before.rev !== rev) return setRows(initial);
    const same = (a: Row, b: Row) => a.source === b.source && a.unit === b.unit && a.nominal === b.nominal;
    setRows((r) => {
      const out: Record<string, Row> = {};
      for (const [k, v] of Object.entries(initial)) out[k] = r[k] && before.initial[k] && !same(r[k], before.initial[k]) ? r[k] : v;
      return out;
    });
  }, [initial, rev]);
  const update = useUpdateMappings();
  const lotUpdate = useUpdateDataset();
  const labels = dataset.columns.filter((c) => c.kind === "label");

  const changed = numeric.filter((c) => {
    const a = rows[c.key],
      b = initial[c.key];
    return a && b && (a.source !== b.source || (a.source && (a.unit !== b.unit || Number(a.nominal) !== Number(b.nominal))));
  });
  const sent = changed.map((c): MappingInput => ({
    column: c.key,
    revisionId: rev,
    source: rows[c.key].source ? splitChoice(rows[c.key].source).source : null,
    ...(rows[c.key].source ? partFields(splitChoice(rows[c.key].source).source, splitChoice(rows[c.key].source).part) : {}),
    ...(rows[c.key].source && rows[c.key].unit ? { unit: rows[c.key].unit as MeasureUnit } : {}),
    ...(rows[c.key].source ? { nominal: Number(rows[c.key].nominal) || 0 } : {}),
  }));
  const errors = new Map<string, string>();
  if (update.isError && isApiError(update.error)) {
    for (const f of update.error.fields) {
      const m = /^mappings\[(\d+)\]/.exec(f.path);
      const col = m ? update.variables?.body.mappings[Number(m[1])]?.column : undefined;
      if (col && !errors.has(col)) errors.set(col, f.message);
    }
  }

  // One change at a time: both carry the data set's version, and the second would be stale.
  function save() {
    if (!sent.length || lotUpdate.isPending) return;
    update.mutate({ id: dataset.id, version: dataset.version, body: { mappings: sent } });
  }

  const set = (key: string, patch: Partial<Row>) =>
    setRows((r) => {
      const next = { ...r[key], ...patch };
      // choosing a source brings its design value from the stack, until the nominal is typed
      if (patch.source !== undefined && !next.nominalEdited)
        next.nominal = stackNominal(
          sources.find((x) => x.id === splitChoice(next.source).source),
          next.unit,
        );
      return { ...r, [key]: next };
    });

  return (
    <div className="flex flex-col">
      <div className="flex flex-wrap items-center gap-3 border-b border-line px-4 py-2.5">
        <label className="flex items-center gap-2 text-xs font-semibold whitespace-nowrap text-ink/75">
          Sources of
          <Select
            compact
            aria-label="Stack revision"
            value={rev}
            onChange={(e) => setRevisionId(e.target.value)}
            className="w-56"
            disabled={!list.length}
          >
            {list.map((r) => (
              <option key={r.id} value={r.id}>
                Revision {r.number} · {r.status.replace("_", " ")}
              </option>
            ))}
          </Select>
        </label>
        {!list.length && !revisions.isPending ? (
          <span className="text-xs text-ink/55">This project has no stack revision to map to yet.</span>
        ) : null}
        {labels.length ? (
          <label className="flex items-center gap-2 text-xs font-semibold whitespace-nowrap text-ink/75">
            Lots from
            <Select
              compact
              aria-label="Lot column"
              value={dataset.lotColumn ?? ""}
              disabled={!canWrite || lotUpdate.isPending || update.isPending}
              onChange={(e) => lotUpdate.mutate({ id: dataset.id, version: dataset.version, body: { lotColumn: e.target.value || null } })}
              className="w-40"
            >
              <option value="">{dataset.lot ? `the upload (lot ${dataset.lot})` : "no lots"}</option>
              {labels.map((c) => (
                <option key={c.key} value={c.key}>
                  {c.key}
                </option>
              ))}
            </Select>
          </label>
        ) : null}
        {canWrite ? (
          <Button
            size="sm"
            variant="primary"
            className="ml-auto"
            disabled={!sent.length || !rev || lotUpdate.isPending}
            pending={update.isPending}
            onClick={save}
          >
            Save mapping{sent.length > 1 ? ` (${sent.length})` : ""}
          </Button>
        ) : null}
      </div>
      {update.isError && errors.size === 0 ? (
        <div className="px-4 pt-3">
          <Alert>{isApiError(update.error) ? update.error.message : "The mapping could not be saved."}</Alert>
        </div>
      ) : null}
      {lotUpdate.isError ? (
        <div className="px-4 pt-3">
          <Alert>{isApiError(lotUpdate.error) ? lotUpdate.error.message : "The lot column could not be saved."}</Alert>
        </div>
      ) : null}
      {/* relative: the header's screen-reader text (absolutely placed) stays inside the scroll box instead of widening the page */}
      <div className="relative overflow-x-auto">
        <table className="w-full border-collapse text-[13px]" aria-label="Column mapping">
          <thead className="border-b border-line bg-paper/70">
            <tr>
              <th scope="col" className={`${th} text-left`}>
                Column
              </th>
              <th scope="col" className={`${th} text-right`}>
                n
              </th>
              <th scope="col" className={`${th} text-right`}>
                Mean
              </th>
              <th scope="col" className={`${th} text-right`}>
                Std dev
              </th>
              <th scope="col" className={`${th} text-left`}>
                Tolerance source
              </th>
              <th scope="col" className={`${th} text-left`}>
                Unit
              </th>
              <th
                scope="col"
                className={`${th} text-left`}
                title="Subtracted from every value: the design value of an absolute measurement"
              >
                Nominal
              </th>
              <th scope="col" className={th}>
                <span className="sr-only">Capability</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {numeric.map((c) => (
              <MappingRow
                key={c.key}
                column={c}
                row={rows[c.key] ?? { source: "", unit: c.unit ?? "", nominal: "0" }}
                sources={sources}
                revisionNumber={list.find((r) => r.id === rev)?.number}
                canWrite={canWrite}
                error={errors.get(c.key)}
                onChange={(p) => set(c.key, p)}
                onNominal={(v) => set(c.key, { nominal: v, nominalEdited: true })}
                onShow={() => onShow(c.key)}
              />
            ))}
          </tbody>
        </table>
      </div>
      {dataset.pooled.length ? (
        <ul
          className="flex flex-col gap-1 border-t border-line px-4 py-2.5 text-xs text-ink/70"
          aria-label="Sources measured by several columns"
        >
          {dataset.pooled.map((p) => (
            <li key={`${p.revisionNumber}-${p.source}`}>
              <span className="font-semibold text-ink">{p.source}</span> (rev {p.revisionNumber}) from {p.columns.length} of {p.parts}{" "}
              columns: {p.completeRows} complete rows
              {p.dropped ? `, ${p.dropped} left out for a gap` : ""}.
              {p.missingParts.length ? ` Still to map: ${p.missingParts.join(", ")}.` : " Each as-built trial draws one unit's whole row."}
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}

function MappingRow({
  column: c,
  row,
  sources,
  revisionNumber,
  canWrite,
  error,
  onChange,
  onNominal,
  onShow,
}: {
  column: DatasetColumn;
  row: Row;
  sources: StackSource[];
  revisionNumber: number | undefined;
  canWrite: boolean;
  error: string | undefined;
  onChange: (p: Partial<Row>) => void;
  onNominal: (v: string) => void;
  onShow: () => void;
}) {
  const kind = row.unit ? unitKind(row.unit) : null;
  const offered = sources.filter((s) => !kind || s.unit === kind);
  const elsewhere = c.mapping && revisionNumber !== undefined && c.mapping.revisionNumber !== revisionNumber ? c.mapping : null;
  const unitChoices = MEASURE_UNITS.filter((u) => !c.unit || u === c.unit);
  const label = `${c.name}${c.unit ? ` [${unitText(c.unit)}]` : ""}`;
  return (
    <>
      <tr className="border-b border-line/70 last:border-b-0" aria-invalid={error ? true : undefined}>
        <td className="h-11 px-3">
          <span className="font-bold text-ink">{c.name}</span>
          <span className="ml-1.5 font-mono text-2xs text-ink/40">{c.letter}</span>
          {elsewhere ? (
            <span className="ml-2 text-2xs text-ink/55">
              mapped on rev {elsewhere.revisionNumber} to {elsewhere.source}
            </span>
          ) : null}
        </td>
        <td className="num h-11 px-3">{c.summary?.n ?? "—"}</td>
        <td className="num h-11 px-3">{c.summary ? formatMeasure(c.summary.mean) : "—"}</td>
        <td className="num h-11 px-3">{c.summary ? formatMeasure(c.summary.std) : "—"}</td>
        <td className="h-11 px-3">
          {canWrite ? (
            <Select
              compact
              aria-label={`Tolerance source for ${label}`}
              value={row.source}
              onChange={(e) => onChange({ source: e.target.value })}
              className="w-72"
              invalid={!!error}
            >
              <option value="">Not mapped</option>
              {offered.flatMap((s) => [
                ...(takesOneColumn(s)
                  ? [
                      <option key={s.id} value={s.id}>
                        {s.id} · {s.parts ? `${s.quantity}, this one column for all` : s.quantity} · {toleranceText(s)}
                      </option>,
                    ]
                  : []),
                ...(s.parts ?? []).map((p) => (
                  <option key={`${s.id}#${p.index}`} value={`${s.id}#${p.index}`}>
                    {s.id} · {p.label}
                  </option>
                )),
              ])}
            </Select>
          ) : row.source ? (
            <Badge tone="accel">{row.source.replace("#", " · part ")}</Badge>
          ) : (
            <span className="text-xs text-ink/45">not mapped</span>
          )}
        </td>
        <td className="h-11 px-3">
          {canWrite && !c.unit ? (
            <Select
              compact
              aria-label={`Unit of ${label}`}
              value={row.unit}
              onChange={(e) => onChange({ unit: e.target.value as MeasureUnit | "" })}
              className="w-24"
            >
              <option value="">unit…</option>
              {unitChoices.map((u) => (
                <option key={u} value={u}>
                  {unitText(u)}
                </option>
              ))}
            </Select>
          ) : (
            <span className="text-xs font-semibold text-ink/70">{unitText(row.unit || c.unit) || "—"}</span>
          )}
        </td>
        <td className="h-11 px-3">
          {canWrite ? (
            <Input
              compact
              inputMode="decimal"
              aria-label={`Nominal of ${label}`}
              value={row.nominal}
              onChange={(e) => onNominal(e.target.value)}
              className="w-20 text-right tabular-nums"
              disabled={!row.source}
            />
          ) : (
            <span className="num text-xs">{row.nominal}</span>
          )}
        </td>
        <td className="h-11 px-3 text-right">
          <Button size="sm" variant="ghost" onClick={onShow} aria-label={`Capability of ${label}`}>
            Capability
          </Button>
        </td>
      </tr>
      {error ? (
        <tr>
          <td colSpan={8} className="px-3 pb-2 text-xs font-medium text-fail" role="alert">
            {sentence(error)}
          </td>
        </tr>
      ) : null}
    </>
  );
}
