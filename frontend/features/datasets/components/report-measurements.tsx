import { useRef, useState, type ChangeEvent } from "react";
import { DATASET_MAX_BYTES } from "@shared/schemas/datasets";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { Input } from "@frontend/components/ui/field";
import { PlusIcon } from "@frontend/components/ui/icons";
import { Panel } from "@frontend/components/ui/panel";
import { Spinner } from "@frontend/components/ui/spinner";
import { formatDateTime } from "@frontend/lib/format";
import { useReportDatasets } from "../api/get-report-datasets";
import { useUploadReportDataset } from "../api/upload-report-dataset";
import { UploadRefusal } from "./upload-refusal";
import { formatCount } from "@shared/format";

/**
 * On a released report: the measurement files sent for it, and (for the supplier, or staff on
 * its behalf) a button to send one. Meant for the report page; it needs only the report's id.
 */
export function ReportMeasurements({ reportId, canSend }: { reportId: string; canSend: boolean }) {
  const list = useReportDatasets(reportId);
  const send = useUploadReportDataset();
  const input = useRef<HTMLInputElement>(null);
  const [lot, setLot] = useState("");
  const [note, setNote] = useState("");

  function onFile(e: ChangeEvent<HTMLInputElement>) {
    const file = e.target.files?.[0];
    e.target.value = "";
    if (!file) return;
    send.reset();
    send.mutate({ reportId, file, lot, note }, { onSuccess: () => setNote("") });
  }

  const rows = list.data ?? [];
  return (
    <Panel
      title="Measurements sent"
      meta={rows.length ? `${rows.length}` : undefined}
      accent="var(--color-accel)"
      actions={
        canSend ? (
          <>
            <Input
              compact
              aria-label="Lot of the measured units"
              placeholder="Lot (optional)"
              value={lot}
              onChange={(e) => setLot(e.target.value)}
              className="w-32"
              maxLength={100}
            />
            <Input
              compact
              aria-label="Note for the engineer"
              placeholder="Note (optional)"
              value={note}
              onChange={(e) => setNote(e.target.value)}
              className="w-48"
              maxLength={2000}
            />
            <input
              ref={input}
              type="file"
              accept=".csv,.txt,.tsv,.xlsx"
              className="sr-only"
              aria-label="Measurement file for this report (CSV or XLSX)"
              onChange={onFile}
              tabIndex={-1}
            />
            <Button
              size="sm"
              variant="primary"
              icon={<PlusIcon size={14} />}
              pending={send.isPending}
              onClick={() => input.current?.click()}
            >
              Send measurements
            </Button>
          </>
        ) : null
      }
    >
      <div className="flex flex-col gap-3">
        {canSend ? (
          <p className="text-xs text-ink/60">
            One row per unit, one column per measured quantity with its unit in the header, e.g. “tilt_x [deg]” or “bond line [µm]”; CSV or
            .xlsx, up to {DATASET_MAX_BYTES / 1048576} MB.
          </p>
        ) : null}
        {send.isError ? <UploadRefusal error={send.error} onDismiss={() => send.reset()} /> : null}
        {send.isSuccess ? (
          <Alert tone="info" title="Received">
            “{send.data.name}”: {formatCount(send.data.rows)} rows.
          </Alert>
        ) : null}
        {list.isPending ? (
          <p className="flex items-center gap-2 text-[13px] text-ink/55">
            <Spinner /> Loading…
          </p>
        ) : rows.length === 0 ? (
          <p className="text-[13px] text-ink/55">Nothing sent yet.</p>
        ) : (
          <div className="flex flex-col gap-2">
            {byLot(rows).map(([group, items]) => (
              <section key={group} aria-label={group}>
                <h4 className="text-2xs font-bold tracking-[0.08em] text-ink/50 uppercase">{group}</h4>
                <ul
                  className="flex flex-col divide-y divide-line/70 text-[13px]"
                  aria-label={`Measurements sent for this report, ${group}`}
                >
                  {items.map((d) => (
                    <li key={d.id} className="flex flex-wrap items-baseline justify-between gap-x-2 py-1.5">
                      <span className="font-semibold break-all text-ink">{d.name}</span>
                      <span className="text-xs text-ink/60 tabular-nums">
                        {formatCount(d.rows)} rows · {d.uploadedByName ?? "a removed member"} · {formatDateTime(d.createdAt)}
                      </span>
                      {d.note ? <p className="w-full text-xs break-words text-ink/70">{d.note}</p> : null}
                    </li>
                  ))}
                </ul>
              </section>
            ))}
          </div>
        )}
      </div>
    </Panel>
  );
}

/** The uploads by the lot they were sent for (in order of first appearance), those without a lot last. */
function byLot<T extends { lot: string | null }>(rows: T[]): Array<[string, T[]]> {
  const groups = new Map<string, T[]>();
  for (const d of rows) {
    const key = d.lot ? `Lot ${d.lot}` : "No lot given";
    groups.set(key, [...(groups.get(key) ?? []), d]);
  }
  return [...groups].sort(([a], [b]) => Number(a === "No lot given") - Number(b === "No lot given"));
}
