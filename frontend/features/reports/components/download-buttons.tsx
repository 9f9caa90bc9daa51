import { REPORT_FILE_KINDS } from "@shared/schemas/reports";
import { cn } from "@frontend/lib/cn";
import { FILE_LABEL, reportFileHref } from "../lib/files";

const base = "inline-flex h-8.5 items-center gap-1.5 rounded-md border px-3 text-[13px] font-semibold whitespace-nowrap transition-colors";

/** Plain links: the browser downloads with the session cookie, and the server records each download. */
export function DownloadButtons({
  reportId,
  compact = false,
  onDownload,
}: {
  reportId: string;
  compact?: boolean;
  onDownload?: () => void;
}) {
  return (
    <div className="flex flex-wrap gap-1.5" role="group" aria-label="Download the report">
      {REPORT_FILE_KINDS.map((kind, i) => (
        <a
          key={kind}
          href={reportFileHref(reportId, kind)}
          download
          onClick={onDownload}
          className={cn(
            base,
            compact && "h-7 px-2.5 text-xs",
            i === 0 ? "border-ink bg-ink text-paper hover:bg-ink/90" : "border-line bg-panel text-ink hover:border-ink/30 hover:bg-white",
          )}
        >
          <svg
            width="13"
            height="13"
            viewBox="0 0 16 16"
            aria-hidden="true"
            fill="none"
            stroke="currentColor"
            strokeWidth="1.6"
            strokeLinecap="round"
            strokeLinejoin="round"
          >
            <path d="M8 2v8M4.5 6.8 8 10.3l3.5-3.5M3 13h10" />
          </svg>
          {FILE_LABEL[kind]}
        </a>
      ))}
    </div>
  );
}
