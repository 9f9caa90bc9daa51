/**
 * What the editor says when someone else saved the draft while this engineer was editing it:
 * the edits are kept on screen (and in this browser), nothing is saved until the engineer
 * chooses to reload the draft and reapply them on top, or to drop them.
 */
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";

export type Reapplied = { version: number; overlaps: string[] };

export function ConflictNotice({
  message,
  version,
  pending,
  error,
  onReapply,
  onDiscard,
}: {
  message: string;
  version: number | undefined;
  pending: "reapply" | "discard" | null;
  error: string | null;
  onReapply: () => void;
  onDiscard: () => void;
}) {
  return (
    <Alert className="mb-3" title="Someone else saved this draft while you were editing it">
      <div data-testid="save-conflict" className="flex flex-col gap-2">
        <p>
          {message} Your edits are still here and were not saved
          {version !== undefined ? `; the draft on the server is now at version ${version}` : ""}. Reload it to see their change with yours
          applied on top, then it saves again; or drop your edits and keep theirs.
        </p>
        <div className="flex flex-wrap items-center gap-2">
          <Button size="sm" variant="primary" pending={pending === "reapply"} disabled={pending !== null} onClick={onReapply}>
            Reload and reapply my edits
          </Button>
          <Button size="sm" variant="ghost" pending={pending === "discard"} disabled={pending !== null} onClick={onDiscard}>
            Discard my edits
          </Button>
        </div>
        {error ? <p className="font-semibold">{error}</p> : null}
      </div>
    </Alert>
  );
}

export function ReappliedNotice({ reapplied, onClose }: { reapplied: Reapplied; onClose: () => void }) {
  return (
    <Alert tone="info" className="mb-3" title={`Your edits were reapplied on top of version ${reapplied.version}`}>
      <div data-testid="save-reapplied" className="flex flex-col gap-1.5">
        {reapplied.overlaps.length ? (
          <p>
            You and the other person both changed {reapplied.overlaps.length === 1 ? "this place" : "these places"}; your value was kept:{" "}
            {reapplied.overlaps.join(", ")}.
          </p>
        ) : (
          <p>Their change and yours did not touch the same values; both are in the draft now.</p>
        )}
        <p>Undo (Ctrl+Z) shows their version without your edits.</p>
        <div>
          <Button size="sm" variant="ghost" onClick={onClose}>
            Close
          </Button>
        </div>
      </div>
    </Alert>
  );
}
