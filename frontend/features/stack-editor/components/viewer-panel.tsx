/** The editor's 3D view, loaded lazily, with a fallback when it cannot load. */
import { lazy, Suspense } from "react";
import { Spinner } from "@frontend/components/ui/spinner";
import type { StackViewerProps } from "@frontend/features/viewer3d";
import { PanelErrorBoundary } from "./error-boundary";

const StackViewer = lazy(() => import("@frontend/features/viewer3d"));

export function ViewerPanel(props: StackViewerProps) {
  return (
    <div className="min-h-[480px] overflow-hidden rounded-lg border border-line bg-[#17212b]">
      <PanelErrorBoundary
        fallback={(error) => (
          <div className="flex h-full items-center justify-center p-6 text-center text-[13px] text-paper/70">
            3D view unavailable: {error.message}
          </div>
        )}
      >
        <Suspense
          fallback={
            <div className="flex h-full items-center justify-center gap-2 text-[13px] text-paper/70">
              <Spinner /> Loading the 3D view…
            </div>
          }
        >
          <StackViewer {...props} className="h-full" />
        </Suspense>
      </PanelErrorBoundary>
    </div>
  );
}
