import { Spinner } from "@frontend/components/ui/spinner";
import { cn } from "@frontend/lib/cn";
import type { SaveState } from "../hooks/use-autosave";

const time = new Intl.DateTimeFormat("en-GB", { hour: "2-digit", minute: "2-digit" });
const dayTime = new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", hour: "2-digit", minute: "2-digit" });
const when = (d: Date) => (d.toDateString() === new Date().toDateString() ? time.format(d) : dayTime.format(d));

/** "Saved · 12:04", "Saving…", or why the draft is not saved. */
export function SaveStatus({ state, saves, onRetry }: { state: SaveState; saves: number; onRetry: () => void }) {
  let text: string;
  let tone = "text-ink/55";
  switch (state.kind) {
    case "saved":
      text = state.at && !Number.isNaN(state.at.getTime()) ? `Saved · ${when(state.at)}` : "Saved";
      break;
    case "pending":
      text = "Unsaved changes";
      break;
    case "saving":
      text = "Saving…";
      break;
    case "invalid":
      text = `Not saved: ${state.count} problem${state.count === 1 ? "" : "s"} to fix`;
      tone = "text-[#a1461f]";
      break;
    case "error":
      text = `Not saved: ${state.message}`;
      tone = "text-fail";
      break;
    case "conflict":
      text = "Not saved: changed by someone else";
      tone = "text-fail";
      break;
  }
  return (
    <span
      role="status"
      aria-live="polite"
      data-testid="save-status"
      data-state={state.kind}
      data-saves={saves}
      className={cn("inline-flex max-w-[300px] items-center gap-1.5 px-1 text-xs font-semibold", tone)}
      title={text}
    >
      {state.kind === "saving" ? (
        <Spinner size={12} />
      ) : state.kind === "saved" ? (
        <span className="size-1.5 rounded-full bg-pass" aria-hidden="true" />
      ) : null}
      <span className="truncate">{text}</span>
      {state.kind === "error" && state.retryable ? (
        <button type="button" onClick={onRetry} className="shrink-0 text-gyro underline underline-offset-2 hover:text-ink">
          Retry
        </button>
      ) : null}
    </span>
  );
}
