import { Spinner } from "@frontend/components/ui/spinner";
import { formatDateTime, formatRelative, initials } from "@frontend/lib/format";
import { useProjectActivity } from "../api/get-project-activity";

// Colour by what kind of thing happened, so a long history reads at a glance.
function actionColour(action: string): string {
  if (action.includes("delete") || action.includes("remove")) return "var(--color-fail)";
  if (action.includes("create")) return "var(--color-accel)";
  if (action.includes("study")) return "var(--color-gyro)";
  if (action.includes("report")) return "var(--color-mag)";
  return "var(--color-asic)";
}

export function ActivityList({ projectId }: { projectId: string }) {
  const { data, isPending, isError, error } = useProjectActivity(projectId);

  if (isPending)
    return (
      <div className="flex items-center gap-2 text-xs text-ink/55">
        <Spinner size={12} /> Loading activity…
      </div>
    );
  if (isError) return <p className="text-xs text-fail">{error.message}</p>;
  if (data.length === 0) return <p className="text-xs text-ink/55">Nothing recorded yet.</p>;

  return (
    <ol className="relative space-y-3.5" aria-label="Project activity">
      <span className="absolute top-2 bottom-2 left-[11px] w-px bg-line" aria-hidden="true" />
      {data.map((item) => (
        <li key={item.id} className="relative flex gap-3">
          <span
            className="relative z-10 mt-0.5 flex size-[23px] shrink-0 items-center justify-center rounded-full border-2 border-panel text-[9px] font-extrabold text-white"
            style={{ background: actionColour(item.action) }}
            aria-hidden="true"
          >
            {item.actorName ? initials(item.actorName) : "·"}
          </span>
          <div className="min-w-0 text-[13px]">
            <p className="text-ink/85">
              {item.actorName ? <span className="font-bold text-ink">{item.actorName} </span> : null}
              {item.summary}
            </p>
            <time dateTime={item.createdAt} title={formatDateTime(item.createdAt)} className="text-xs text-ink/50 tabular-nums">
              {formatRelative(item.createdAt)}
            </time>
          </div>
        </li>
      ))}
    </ol>
  );
}
