import { lazy, Suspense, useId, useRef } from "react";
import type { StackFile } from "@shared/schemas/stack-file";
import type { StudyFile } from "@shared/schemas/study-file";
import { CloseIcon } from "@frontend/components/ui/icons";
import { ModalDialog } from "@frontend/components/ui/modal-dialog";
import { Spinner } from "@frontend/components/ui/spinner";
import { formatCount } from "@shared/format";

// three.js stays in its own chunk until someone opens a trial.
const StackViewer = lazy(() => import("@frontend/features/viewer3d"));

export type WorstTrialPick = { metric: string; trialIndex: number; value: number; unit?: string };

/**
 * A large sheet over the results with the 3D view of one trial of the study, regenerated
 * from the seed, on the same modal primitive as every dialog. The viewer's own picker moves between the worst trials of every metric.
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

  if (!open) return null;
  return (
    <ModalDialog
      onRequestClose={onClose}
      panelRef={panel}
      labelledBy={titleId}
      className="fixed inset-0 z-50 m-0 flex h-full max-h-none w-full max-w-none items-stretch justify-center bg-transparent p-4 sm:p-6 backdrop:bg-ink/55 backdrop:backdrop-blur-[1.5px]"
    >
      <div
        ref={panel}
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
    </ModalDialog>
  );
}
