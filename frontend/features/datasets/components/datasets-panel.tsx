import { useRef, useState, type ChangeEvent } from "react";
import { Link, useNavigate } from "react-router";
import { DATASET_MAX_BYTES, type DatasetSummary } from "@shared/schemas/datasets";
import { Alert } from "@frontend/components/ui/alert";
import { Badge } from "@frontend/components/ui/badge";
import { Button } from "@frontend/components/ui/button";
import { EmptyState } from "@frontend/components/ui/empty-state";
import { Input, Select } from "@frontend/components/ui/field";
import { PlusIcon } from "@frontend/components/ui/icons";
import { Panel } from "@frontend/components/ui/panel";
import { Spinner } from "@frontend/components/ui/spinner";
import { isApiError } from "@frontend/lib/api-client";
import { cn } from "@frontend/lib/cn";
import { formatDateTime, formatRelative } from "@frontend/lib/format";
import { useDatasets } from "../api/get-datasets";
import { useUploadDataset } from "../api/upload-dataset";
import { UploadRefusal } from "./upload-refusal";
import { reportNumber } from "@shared/reports/format";
import { formatBytes, formatCount } from "@shared/format";

const th = "h-7 px-3 text-2xs font-bold tracking-[0.06em] text-ink/55 uppercase";

/** The project's measured data sets: upload (writers), and who sent each one and when. */
export function DatasetsPanel({ projectId, canWrite, className }: { projectId: string; canWrite: boolean; className?: string }) {
  const datasets = useDatasets(projectId);
  const uploadMutation = useUploadDataset();
  const input = useRef<HTMLInputElement>(null);
  const navigate = useNavigate();
  const [tooBig, setTooBig] = useState<string | null>(null);
  const [lot, setLot] = useState("");
  const [note, setNote] = useState("");
  const [groupBy, setGroupBy] = useState<GroupBy>("none");
  const list = datasets.data ?? [];

  function onFile(e: ChangeEvent<HTMLInputElement>) {
    const file = e.target.files?.[0];
    e.target.value = "";
    if (!file) return;
    setTooBig(null);
    uploadMutation.reset();
    // The server refuses it too; saying so here spares sending 5 MB for nothing.
    if (file.size > DATASET_MAX_BYTES) {
      setTooBig(`“${file.name}” is ${formatBytes(file.size)}; a data set file may be at most ${DATASET_MAX_BYTES / 1048576} MB.`);
      return;
    }
    uploadMutation.mutate({ projectId, file, lot, note }, { onSuccess: (d) => navigate(`/projects/${projectId}/datasets/${d.id}`) });
  }

  return (
    <Panel
      title="Data sets"
      meta={list.length ? `${list.length}` : undefined}
      accent="var(--color-accel)"
      padded={false}
      className={cn("md:col-span-2", className)}
      actions={
        canWrite ? (
          <>
            <Input
              compact
              aria-label="Lot of the upload"
              placeholder="Lot (optional)"
              value={lot}
              onChange={(e) => setLot(e.target.value)}
              className="w-32"
              maxLength={100}
            />
            <Input
              compact
              aria-label="Note on the upload"
              placeholder="Note (optional)"
              value={note}
              onChange={(e) => setNote(e.target.value)}
              className="w-48"
              maxLength={2000}
            />
            <input
              ref={input}
              type="file"
              accept=".csv,.txt,.tsv,.xlsx,text/csv,application/vnd.openxmlformats-officedocument.spreadsheetml.sheet"
              className="sr-only"
              aria-label="Measurement file (CSV or XLSX)"
              onChange={onFile}
              tabIndex={-1}
            />
            <Button
              size="sm"
              variant="primary"
              icon={<PlusIcon size={14} />}
              pending={uploadMutation.isPending}
              onClick={() => input.current?.click()}
            >
              Upload measurements
            </Button>
          </>
        ) : null
      }
    >
      {tooBig ? (
        <div className="border-b border-line p-3">
          <Alert title="File too large">{tooBig}</Alert>
        </div>
      ) : null}
      {uploadMutation.isError ? (
        <div className="border-b border-line p-3">
          <UploadRefusal error={uploadMutation.error} onDismiss={() => uploadMutation.reset()} />
        </div>
      ) : null}
      {datasets.isPending ? (
        <p className="flex items-center gap-2 px-4 py-6 text-[13px] text-ink/55">
          <Spinner /> Loading data sets…
        </p>
      ) : datasets.isError ? (
        <p className="px-4 py-6 text-[13px] text-fail">
          {isApiError(datasets.error) ? datasets.error.message : "The data sets could not be loaded."}
        </p>
      ) : list.length === 0 ? (
        <EmptyState title="No measurements yet" className="py-8">
          Upload first-build measurements as CSV or an Excel workbook: one row per unit, one column per quantity, the unit in the header
          (“tilt_x [deg]”). Map a column to a tolerance source to read its capability and run the stack as built.
        </EmptyState>
      ) : (
        <div className="overflow-x-auto">
          <div className="flex items-center gap-2 border-b border-line px-3 py-1.5">
            <label className="flex items-center gap-2 text-xs font-semibold text-ink/70">
              Group
              <Select
                compact
                aria-label="Group data sets by"
                value={groupBy}
                onChange={(e) => setGroupBy(e.target.value as GroupBy)}
                className="w-40"
              >
                <option value="none">newest first</option>
                <option value="lot">by lot</option>
                <option value="report">by report</option>
              </Select>
            </label>
          </div>
          <table className="w-full border-collapse text-[13px]" aria-label="Data sets">
            <thead className="border-b border-line bg-paper/70">
              <tr>
                <th scope="col" className={`${th} text-left`}>
                  File
                </th>
                <th scope="col" className={`${th} text-right`}>
                  Rows
                </th>
                <th scope="col" className={`${th} text-left`}>
                  Mapped to
                </th>
                <th scope="col" className={`${th} text-left`}>
                  Sent by
                </th>
                <th scope="col" className={`${th} text-right`}>
                  When
                </th>
              </tr>
            </thead>
            <tbody>
              {grouped(list, groupBy).flatMap(({ label, rows }) => [
                ...(label !== null
                  ? [
                      <tr key={`group-${label}`} className="border-b border-line bg-paper/60" data-group={label}>
                        <th scope="rowgroup" colSpan={5} className="px-3 py-1 text-left text-xs font-bold text-ink/75">
                          {label}{" "}
                          <span className="font-normal text-ink/50">
                            · {rows.length} {rows.length === 1 ? "file" : "files"}
                          </span>
                        </th>
                      </tr>,
                    ]
                  : []),
                ...rows.map((d) => (
                  <tr key={d.id} className="border-b border-line/70 last:border-b-0 hover:bg-paper/60">
                    <td className="h-10 max-w-[280px] px-3 py-1.5">
                      <Link
                        to={`/projects/${projectId}/datasets/${d.id}`}
                        className="block font-bold break-all text-ink hover:text-accel hover:underline"
                        title={d.name}
                      >
                        {d.name}
                      </Link>
                      <span className="text-2xs text-ink/50 uppercase">
                        {d.fileType}
                        {d.sheet ? ` · sheet ${d.sheet}` : ""} · {d.columnCount} columns
                      </span>
                      {d.lot ? <span className="ml-1.5 text-2xs font-semibold text-ink/70">lot {d.lot}</span> : null}
                      {d.note ? (
                        <span className="block truncate text-2xs text-ink/55" title={d.note}>
                          {d.note}
                        </span>
                      ) : null}
                    </td>
                    <td className="num h-10 px-3">{formatCount(d.rows)}</td>
                    <td className="h-10 px-3">
                      {d.mappedColumns.length ? (
                        <span className="flex flex-wrap gap-1">
                          {d.mappedColumns.map((m) => (
                            <Badge key={m.column} tone="accel">
                              {m.source}
                            </Badge>
                          ))}
                        </span>
                      ) : (
                        <span className="text-xs text-ink/45">not mapped</span>
                      )}
                    </td>
                    <td className="h-10 px-3">
                      <span className="font-semibold text-ink">{d.uploadedByName ?? "a removed member"}</span>
                      {d.supplierName ? (
                        <span className="ml-1.5 inline-flex items-center gap-1 align-middle">
                          <Badge tone="substrate">{d.supplierName}</Badge>
                          {d.report ? <span className="text-2xs text-ink/55">{reportNumber(d.report)}</span> : null}
                        </span>
                      ) : null}
                    </td>
                    <td className="num h-10 px-3 text-ink/70">
                      <time dateTime={d.createdAt} title={formatDateTime(d.createdAt)}>
                        {formatRelative(d.createdAt)}
                      </time>
                    </td>
                  </tr>
                )),
              ])}
            </tbody>
          </table>
        </div>
      )}
    </Panel>
  );
}

type GroupBy = "none" | "lot" | "report";

/** The data sets in groups (by the lot they were sent for, or by report), newest first within each. */
function grouped(list: DatasetSummary[], by: GroupBy): { label: string | null; rows: DatasetSummary[] }[] {
  if (by === "none") return [{ label: null, rows: list }];
  const key = (d: DatasetSummary) =>
    by === "lot"
      ? d.lot
        ? `Lot ${d.lot}`
        : "No lot given"
      : d.report
        ? `${reportNumber(d.report)}${d.supplierName ? ` · ${d.supplierName}` : ""}`
        : "Not sent for a report";
  const groups = new Map<string, DatasetSummary[]>();
  for (const d of list) groups.set(key(d), [...(groups.get(key(d)) ?? []), d]);
  return [...groups.entries()].map(([label, rows]) => ({ label, rows }));
}
