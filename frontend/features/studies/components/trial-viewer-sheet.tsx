import { lazy, Suspense, useEffect, useId, useRef } from "react";
import { createPortal } from "react-dom";
import type { StackFile } from "@shared/schemas/stack-file";
import type { StudyFile } from "@shared/schemas/study-file";
import { CloseIcon } from "@frontend/components/ui/icons";
import { Spinner } from "@frontend/components/ui/spinner";
import { formatCount } from "@shared/format";

// three.js stays in its own chunk until someone opens a trial.
const StackViewer = lazy(() => import("@frontend/features/viewer3d"));

export type WorstTrialPick = { metric: string; trialIndex: number; value: number; unit?: string };

/**
 * A large sheet over the results with the 3D view of one trial of the study, regenerated
 * from the seed. The viewer's own picker moves between the worst trials of every metric.
 */
export function TrialViewerSheet({
  open,
  onClose,
  studyNumber,
  revisionNumber,
  stack,
  study,
  worstTrials,
  trialIndex,
  onTrialChange,
  caption,
}: {
  open: boolean;
  onClose: () => void;
  studyNumber: number;
  /** the stack revision the study ran on */
  revisionNumber?: number;
  stack: StackFile;
  study: StudyFile;
  worstTrials: WorstTrialPick[];
  trialIndex: number | null;
  onTrialChange: (t: number | null) => void;
  caption?: string;
}) {
  const titleId = useId();
  const panel = useRef<HTMLDivElement>(null);
  const close = useRef(onClose);
  close.current = onClose;

  useEffect(() => {
    if (!open) return;
    const opener = document.activeElement as HTMLElement | null;
    panel.current?.focus();
    const onKey = (e: KeyboardEvent) => {
      if (e.key === "Escape") {
        e.stopPropagation();
        close.current();
      }
    };
    document.addEventListener("keydown", onKey);
    const { overflow } = document.body.style;
    document.body.style.overflow = "hidden";
    return () => {
      document.removeEventListener("keydown", onKey);
      document.body.style.overflow = overflow;
      opener?.focus?.();
    };
  }, [open]);

  if (!open) return null;
  return createPortal(
    <div className="fixed inset-0 z-50 flex items-stretch justify-center p-4 sm:p-6">
      <div className="fixed inset-0 bg-ink/55 backdrop-blur-[1.5px]" aria-hidden="true" onMouseDown={onClose} />
      <div
        ref={panel}
        role="dialog"
        aria-modal="true"
        aria-labelledby={titleId}
        tabIndex={-1}
        className="relative flex w-full max-w-[1400px] flex-col overflow-hidden rounded-xl border border-line bg-panel shadow-[0_24px_60px_-12px_rgba(23,33,43,0.45)] focus:outline-none"
      >
        <div className="flex items-center justify-between gap-4 border-b border-line px-5 py-3">
          <div className="min-w-0">
            <h2 id={titleId} className="text-[15px] font-extrabold tracking-[-0.01em] text-ink">
              Study {studyNumber}: {trialIndex === null ? "nominal pose" : `trial ${formatCount(trialIndex)}`}
            </h2>
            {caption ? <p className="truncate text-xs text-ink/60">{caption}</p> : null}
          </div>
          <button
            type="button"
            onClick={onClose}
            aria-label="Close the 3D view"
            className="flex size-8 shrink-0 items-center justify-center rounded-md text-ink/55 hover:bg-ink/[0.06] hover:text-ink"
          >
            <CloseIcon />
          </button>
        </div>
        <div className="min-h-0 flex-1">
          <Suspense
            fallback={
              <div className="flex h-full items-center justify-center gap-2 text-[13px] text-ink/60">
                <Spinner /> Loading the 3D view…
              </div>
            }
          >
            <StackViewer
              stack={stack}
              study={study}
              worstTrials={worstTrials}
              trialIndex={trialIndex}
              onTrialChange={onTrialChange}
              revisionLabel={`study ${studyNumber}${revisionNumber !== undefined ? ` of revision ${revisionNumber}` : ""}`}
              className="h-full"
            />
          </Suspense>
        </div>
      </div>
    </div>,
    document.body,
  );
}
