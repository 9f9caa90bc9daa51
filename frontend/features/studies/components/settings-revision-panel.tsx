import type { RevisionSummary } from "@shared/schemas/revisions";
import { Field, Input, Select } from "@frontend/components/ui/field";
import { Panel } from "@frontend/components/ui/panel";
import { Spinner } from "@frontend/components/ui/spinner";
import { Table, THead, Td, Th, Tr } from "@frontend/components/ui/table";
import { metricLabel } from "@shared/metrics";
import type { SettingsSectionProps } from "./settings-section-props";
import { formatCount, formatDeg, formatMrad, formatPct, formatYield } from "@shared/format";

const REVISION_STATUS: Record<string, string> = { draft: "draft", in_review: "in review", approved: "approved" };

export interface RequirementRow {
  metric: string;
  max: number;
  yield: number;
}

/** Which revision the study runs on, its label, and the requirements it will be judged against. */
export function SettingsRevisionPanel({
  v,
  set,
  errors,
  revisions,
  revisionId,
  onRevision,
  loading,
  requirements,
  showFormError,
}: SettingsSectionProps & {
  revisions: RevisionSummary[];
  revisionId: string;
  onRevision: (id: string) => void;
  loading: boolean;
  requirements: RequirementRow[];
  /** the form-wide error belongs here unless it came from the server */
  showFormError: boolean;
}) {
  const currentRevision = revisions.find((r) => r.id === revisionId);
  return (
    <Panel title="Stack revision" accent="var(--color-asic)">
      <div className="grid gap-4 sm:grid-cols-[minmax(0,1.6fr)_minmax(0,1fr)]">
        <Field label="Revision" hint={currentRevision?.note || undefined}>
          {({ id, describedBy }) => (
            <Select id={id} aria-describedby={describedBy} compact value={revisionId} onChange={(e) => onRevision(e.target.value)}>
              {revisions.map((r) => (
                <option key={r.id} value={r.id}>
                  Revision {r.number} ({REVISION_STATUS[r.status] ?? r.status}): {r.name}
                </option>
              ))}
            </Select>
          )}
        </Field>
        <Field label="Label" aside="optional" error={errors.label}>
          {({ id, describedBy, invalid }) => (
            <Input
              id={id}
              compact
              aria-describedby={describedBy}
              invalid={invalid}
              value={v.label}
              maxLength={120}
              placeholder="e.g. Calibrated at board level"
              onChange={(e) => set("label", e.target.value)}
            />
          )}
        </Field>
      </div>
      {currentRevision && currentRevision.status !== "approved" ? (
        <p className="mt-2 text-xs text-[#8a5a00]">
          This revision is a {REVISION_STATUS[currentRevision.status]}: a study on it is fine for exploring, but reports need an approved
          revision.
        </p>
      ) : null}
      <div className="mt-3">
        <p className="mb-1.5 text-xs font-semibold text-ink/80">Requirements of revision {currentRevision?.number ?? ""}</p>
        {loading ? (
          <p className="flex items-center gap-2 text-xs text-ink/55">
            <Spinner /> Loading the revision…
          </p>
        ) : requirements.length ? (
          <div className="overflow-hidden rounded-md border border-line/80">
            <Table aria-label="Requirements of the revision">
              <THead>
                <tr>
                  <Th>Metric</Th>
                  <Th align="right">Limit, absolute value</Th>
                  <Th align="right">Yield target</Th>
                  <Th align="right">Allowed out</Th>
                </tr>
              </THead>
              <tbody>
                {requirements.map((r) => {
                  const pct = r.metric.includes("Pct");
                  return (
                    <Tr key={r.metric}>
                      <Td className="h-8 text-xs">
                        <span className="font-semibold">{metricLabel(r.metric)}</span>
                        <span className="block font-mono text-2xs break-all text-ink/45">{r.metric}</span>
                      </Td>
                      <Td numeric className="h-8 text-xs">
                        ≤ {pct ? formatPct(r.max) : `${formatDeg(r.max)} (${formatMrad(r.max)})`}
                      </Td>
                      <Td numeric className="h-8 text-xs">
                        {formatYield(r.yield)}
                      </Td>
                      <Td numeric className="h-8 text-xs text-ink/60">
                        {formatCount((1 - r.yield) * 1e6)} ppm
                      </Td>
                    </Tr>
                  );
                })}
              </tbody>
            </Table>
          </div>
        ) : (
          <p className="text-xs text-ink/55">This revision has no requirements: the study reports the metrics without a verdict.</p>
        )}
        {errors._form && showFormError ? <p className="mt-2 text-xs font-medium text-fail">{errors._form}</p> : null}
      </div>
    </Panel>
  );
}
