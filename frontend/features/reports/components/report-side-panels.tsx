import { Link } from "react-router";
import type { Report } from "@shared/schemas/reports";
import { CopyButton } from "@frontend/components/ui/copy-button";
import { Panel } from "@frontend/components/ui/panel";
import { cn } from "@frontend/lib/cn";
import { formatDateTime } from "@frontend/lib/format";
import { FILE_LABEL } from "../lib/files";
import { DownloadButtons } from "./download-buttons";
import { formatBytes } from "@shared/format";

/** Download buttons, and for a released report the stored files with their checksums. */
export function ReportFilesPanel({ report }: { report: Report }) {
  return (
    <Panel title="Files" meta={report.status === "draft" ? "made on download" : "stored at release"}>
      <DownloadButtons reportId={report.id} compact />
      {report.files.length ? (
        <ul className="mt-3 space-y-2" aria-label="Stored files">
          {report.files.map((f) => (
            <li key={f.kind} className="text-xs">
              <p className="flex justify-between gap-2">
                <span className="font-semibold text-ink">{FILE_LABEL[f.kind]}</span>
                <span className="text-ink/50 tabular-nums">{formatBytes(f.size)}</span>
              </p>
              <p className="font-mono text-[10.5px] break-all text-ink/60" title="SHA-256 checksum of the file as stored and sent">
                SHA-256 {f.sha256}
              </p>
            </li>
          ))}
        </ul>
      ) : null}
    </Panel>
  );
}

/** Built, released, sent, acknowledged: who and when; staff also get the supplier's link. */
export function ReportRecordPanel({ report, asSupplier }: { report: Report; asSupplier: boolean }) {
  const lastSend = report.sends[0];
  return (
    <Panel title="Record">
      <ol className="space-y-2.5 text-[13px]">
        <RecordStep done label="Built" who={report.createdByName} at={report.createdAt} />
        <RecordStep done={report.status !== "draft"} label="Released" who={report.releasedByName} at={report.releasedAt} />
        {asSupplier ? null : (
          <RecordStep
            done={report.sends.length > 0}
            label="Sent"
            who={lastSend?.sentByName ?? null}
            at={lastSend?.sentAt ?? null}
            extra={
              lastSend
                ? `${lastSend.recipients.map((r) => (r.cc ? `cc ${r.email}` : r.email)).join(", ")}${
                    lastSend.attachments.length ? ` · ${lastSend.attachments.join(", ")}` : " · link only"
                  }`
                : undefined
            }
          />
        )}
        <RecordStep done={!!report.acknowledgedAt} label="Acknowledged" who={report.acknowledgedByName} at={report.acknowledgedAt} />
      </ol>
      {!asSupplier ? (
        <div className="mt-3 flex items-center justify-between gap-2 border-t border-line pt-3">
          <span className="min-w-0 truncate text-xs text-ink/55" title={report.link}>
            Supplier link: {report.link}
          </span>
          <CopyButton value={report.link} />
        </div>
      ) : null}
    </Panel>
  );
}

function RecordStep({
  done,
  label,
  who,
  at,
  extra,
}: {
  done: boolean;
  label: string;
  who: string | null;
  at: string | null;
  extra?: string;
}) {
  return (
    <li className="flex gap-2.5">
      <span
        className={cn("mt-1 size-2.5 shrink-0 rounded-full border-2", done ? "border-pass bg-pass" : "border-line bg-panel")}
        aria-hidden="true"
      />
      <div className="min-w-0">
        <p className={cn("font-semibold", done ? "text-ink" : "text-ink/45")}>
          {label}
          {done && who ? <span className="font-normal text-ink/70"> by {who}</span> : null}
        </p>
        {done && at ? (
          <p className="text-xs text-ink/50 tabular-nums">{formatDateTime(at)}</p>
        ) : (
          <p className="text-xs text-ink/40">not yet</p>
        )}
        {done && extra ? (
          <p className="truncate text-xs text-ink/50" title={extra}>
            {extra}
          </p>
        ) : null}
      </div>
    </li>
  );
}

/** Every revision of this report number, the current one highlighted. */
export function ReportHistoryPanel({ report }: { report: Report }) {
  if (report.history.length <= 1) return null;
  return (
    <Panel title="Revisions of this report" padded={false}>
      <ul className="divide-y divide-line/70 text-[13px]">
        {report.history.map((h) => (
          <li key={h.id} className={cn("flex items-center justify-between px-4 py-2", h.id === report.id && "bg-paper/70")}>
            <Link to={`/reports/${h.id}`} className="font-semibold text-ink hover:underline">
              Revision {h.revision}
            </Link>
            <span className="text-xs text-ink/55">{h.status === "released" ? `released ${formatDateTime(h.releasedAt!)}` : "draft"}</span>
          </li>
        ))}
      </ul>
    </Panel>
  );
}

/** Who downloaded which file (staff only); the supplier's downloads in its colour. */
export function ReportDownloadsPanel({ report }: { report: Report }) {
  if (!report.downloads.length) return null;
  return (
    <Panel title="Downloads" meta={`${report.downloads.length}`} padded={false}>
      <ul className="max-h-56 divide-y divide-line/70 overflow-y-auto text-xs">
        {report.downloads.map((d, i) => (
          <li key={i} className="flex justify-between gap-2 px-4 py-1.5">
            <span>
              <span className={cn("font-semibold", d.role === "supplier" ? "text-mag" : "text-ink")}>{d.userName ?? "—"}</span> ·{" "}
              {d.kind.toUpperCase()}
            </span>
            <span className="text-ink/50 tabular-nums">{formatDateTime(d.at)}</span>
          </li>
        ))}
      </ul>
    </Panel>
  );
}
