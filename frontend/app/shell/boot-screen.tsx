import { LogoMark } from "@frontend/components/ui/logo";

/** What shows while the first page's loaders run (the session check). */
export function BootScreen() {
  return (
    <div className="flex min-h-dvh items-center justify-center bg-paper" aria-busy="true" aria-label="Loading Orthostack">
      <LogoMark size={36} className="animate-pulse" />
    </div>
  );
}
