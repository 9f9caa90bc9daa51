import { useState, type FormEvent } from "react";
import { useQueryClient } from "@tanstack/react-query";
import { useNavigate } from "react-router";
import type { AsBuiltEntry, Dataset } from "@shared/schemas/datasets";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { Dialog } from "@frontend/components/ui/dialog";
import { Field, Select } from "@frontend/components/ui/field";
import { studyQueryOptions, useCreateStudy, useStudies } from "@frontend/features/studies";
import { isApiError } from "@frontend/lib/api-client";
import { fieldProblemText } from "@frontend/lib/form";
import { formatCount } from "@shared/format";

type Choice = { use: boolean; mode: AsBuiltEntry["mode"] };
type Item = { key: string; source: string; column: string | undefined; text: string; pooled: boolean };

/**
 * Runs the stack of a finished design study again with the mapped columns in place of their
 * tolerances, with the same settings and seed, then opens the two side by side.
 */
export function AsBuiltDialog({ dataset, open, onClose }: { dataset: Dataset; open: boolean; onClose: () => void }) {
  const studies = useStudies(dataset.projectId);
  const mapped = dataset.columns.filter((c) => c.mapping);
  const revisionIds = new Set(mapped.map((c) => c.mapping!.revisionId));
  const designs = (studies.data ?? []).filter((s) => s.status === "finished" && revisionIds.has(s.revisionId) && s.asBuilt.length === 0);
  const [designId, setDesignId] = useState("");
  const design = designs.find((s) => s.id === designId) ?? designs[0];
  const [choices, setChoices] = useState<Record<string, Choice>>({});
  const choice = (key: string): Choice => choices[key] ?? { use: true, mode: "resample" };
  const onRev = design ? mapped.filter((c) => c.mapping!.revisionId === design.revisionId) : [];
  // a source measured as several columns is one item: its rows are drawn whole
  const items: Item[] = [
    ...onRev
      .filter((c) => c.mapping!.part === null)
      .map((c) => ({
        key: c.key,
        source: c.mapping!.source,
        column: c.key,
        text: `from “${c.key}” (${c.summary?.n ?? 0} values)`,
        pooled: false,
      })),
    ...[...new Set(onRev.filter((c) => c.mapping!.part !== null).map((c) => c.mapping!.source))].map((src) => {
      const p = dataset.pooled.find((x) => x.source === src);
      const cols = p?.columns ?? [];
      const text = p
        ? `from ${cols.length} columns together (${cols.map((c) => `“${c}”`).join(", ")}): ${p.completeRows} complete rows${p.dropped ? `, ${p.dropped} left out for a gap` : ""}${p.missingParts.length ? `; no column yet for ${p.missingParts.join(", ")}` : ""}`
        : "from several columns";
      return { key: `pool:${src}`, source: src, column: undefined, text, pooled: true };
    }),
  ];
  const entries: AsBuiltEntry[] = items
    .filter((it) => choice(it.key).use)
    .map((it) => ({
      source: it.source,
      datasetId: dataset.id,
      ...(it.column ? { column: it.column } : {}),
      mode: it.pooled ? "resample" : choice(it.key).mode,
    }));
  const create = useCreateStudy();
  const queryClient = useQueryClient();
  const navigate = useNavigate();
  const [loadError, setLoadError] = useState<string | null>(null);
  const [loading, setLoading] = useState(false);

  async function submit(e: FormEvent) {
    e.preventDefault();
    if (!design || !entries.length) return;
    setLoadError(null);
    setLoading(true);
    try {
      // the design study's own frozen file: same trials, seed, field, sweep and requirements
      const full = await queryClient.fetchQuery(studyQueryOptions(design.id));
      create.mutate(
        { revisionId: design.revisionId, body: { study: full.study as Record<string, unknown>, asBuilt: entries } },
        { onSuccess: (s) => navigate(`/projects/${dataset.projectId}/compare?a=${design.id}&b=${s.id}`) },
      );
    } catch (err) {
      setLoadError(isApiError(err) ? err.message : "The design study could not be read.");
    } finally {
      setLoading(false);
    }
  }

  const pending = loading || create.isPending;
  const error =
    loadError ??
    (create.isError
      ? isApiError(create.error)
        ? [create.error.message, ...create.error.fields.map(fieldProblemText)].join(" ")
        : "The study could not be queued."
      : null);

  return (
    <Dialog
      open={open}
      onClose={onClose}
      title="Run as built"
      description="The design study's stack and settings, with the measured columns in place of their tolerances. The two open side by side when the new one is queued."
      busy={pending}
      onSubmit={submit}
      formLabel="Run as built"
      footer={
        <>
          <Button variant="secondary" onClick={onClose} disabled={pending}>
            Cancel
          </Button>
          <Button type="submit" variant="primary" pending={pending} disabled={!design || !entries.length}>
            Queue as-built study
          </Button>
        </>
      }
    >
      <div className="flex flex-col gap-4">
        {mapped.length === 0 ? (
          <Alert tone="info">Map at least one column to a tolerance source first.</Alert>
        ) : designs.length === 0 ? (
          <Alert tone="info">
            {studies.isPending
              ? "Looking for studies…"
              : "No finished design study on the mapped revision yet: run one from the project's studies first."}
          </Alert>
        ) : (
          <>
            <Field label="Design study to mirror">
              {({ id }) => (
                <Select id={id} value={design?.id ?? ""} onChange={(e) => setDesignId(e.target.value)}>
                  {designs.map((s) => (
                    <option key={s.id} value={s.id}>
                      Study {s.number} · rev {s.revisionNumber} · {formatCount(s.trials)} trials, seed {s.seed}
                      {s.label ? ` · ${s.label}` : ""}
                    </option>
                  ))}
                </Select>
              )}
            </Field>
            <fieldset className="flex flex-col gap-2">
              <legend className="mb-1 text-xs font-semibold text-ink/80">Measured columns</legend>
              {items.map((c) => {
                const ch = choice(c.key);
                return (
                  <div key={c.key} className="flex flex-wrap items-center gap-3 rounded-md border border-line px-3 py-2">
                    <label className="flex min-w-0 flex-1 items-center gap-2 text-[13px]">
                      <input
                        type="checkbox"
                        checked={ch.use}
                        onChange={(e) => setChoices((x) => ({ ...x, [c.key]: { ...ch, use: e.target.checked } }))}
                      />
                      <span className="truncate">
                        <span className="font-semibold">{c.source}</span> {c.text}
                      </span>
                    </label>
                    <Select
                      compact
                      aria-label={`How ${c.source} is drawn`}
                      value={c.pooled ? "resample" : ch.mode}
                      disabled={!ch.use || c.pooled}
                      title={c.pooled ? "Each trial takes one unit's whole row, so its columns stay together" : undefined}
                      onChange={(e) => setChoices((x) => ({ ...x, [c.key]: { ...ch, mode: e.target.value as Choice["mode"] } }))}
                      className="w-56"
                    >
                      <option value="resample">{c.pooled ? "Resample whole rows" : "Resample the measurements"}</option>
                      <option value="normal">Fitted normal (mean, 3σ)</option>
                    </Select>
                  </div>
                );
              })}
              {mapped.length > onRev.length ? (
                <p className="text-xs text-ink/55">Columns mapped on another revision than the design study's are left out.</p>
              ) : null}
            </fieldset>
          </>
        )}
        {error ? <Alert>{error}</Alert> : null}
      </div>
    </Dialog>
  );
}
