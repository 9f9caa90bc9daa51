import { Link } from "react-router";
import { WORK_KIND_LABELS, WORK_KINDS, type WorkItem } from "@shared/schemas/review-queue";
import { EmptyState } from "@frontend/components/ui/empty-state";
import { CheckIcon } from "@frontend/components/ui/icons";
import { Panel } from "@frontend/components/ui/panel";
import { formatDateTime, formatRelative } from "@frontend/lib/format";

/** The verb of who put it there, per kind: "submitted by Ezra Lindqvist". */
const BY: Record<WorkItem["kind"], string> = {
  "revision.review": "submitted by",
  "report.release": "built by",
  "revision.returned": "sent back by",
  "report.returned": "sent back by",
  "report.question": "asked by",
};

/** What waits for this person, one panel per kind, the longest waiting first; each row opens the record. */
export function WaitingList({ items }: { items: WorkItem[] }) {
  if (!items.length) {
    return (
      <div className="rounded-lg border border-dashed border-line bg-panel">
        <EmptyState icon={<CheckIcon />} title="Nothing waits for you">
          Submitted revisions, drafts ready for release, work sent back to you and supplier questions show here as they come.
        </EmptyState>
      </div>
    );
  }
  return (
    <div className="space-y-5">
      {WORK_KINDS.map((kind) => {
        const rows = items.filter((i) => i.kind === kind);
        if (!rows.length) return null;
        return (
          <Panel key={kind} title={WORK_KIND_LABELS[kind]} meta={rows.length} padded={false}>
            <ul aria-label={WORK_KIND_LABELS[kind]} className="divide-y divide-line/70">
              {rows.map((item) => (
                <li key={item.link} className="flex flex-wrap items-baseline gap-x-3 gap-y-0.5 px-4 py-2.5 text-[13px]">
                  <Link to={item.link} className="font-bold text-ink decoration-ink/30 underline-offset-2 hover:underline">
                    {item.title}
                  </Link>
                  <Link to={`/projects/${item.projectId}`} className="text-ink/60 hover:text-ink hover:underline">
                    {item.projectName}
                  </Link>
                  <span className="ml-auto text-xs text-ink/55">
                    {item.by ? `${BY[kind]} ${item.by}, ` : ""}
                    <time dateTime={item.since} title={formatDateTime(item.since)}>
                      {formatRelative(item.since)}
                    </time>
                  </span>
                </li>
              ))}
            </ul>
          </Panel>
        );
      })}
    </div>
  );
}
