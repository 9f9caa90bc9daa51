import type { ImportIssue } from "../lib/stack-file-io";
import { Button } from "@frontend/components/ui/button";
import { Dialog } from "@frontend/components/ui/dialog";
import { sentence } from "@frontend/lib/form";
import { pathLabel } from "@shared/field-labels";

/** The place in words: the element is named beside it, so only the field follows. */
function placeOf(i: ImportIssue): string {
  if (!i.path) return "the file";
  const label = pathLabel(i.path);
  return i.element && label.includes(": ") ? label.slice(label.indexOf(": ") + 2) : i.element ? "the element" : label;
}

/** Why a stack file was refused: every problem with its place in the file, in words. */
export function ImportIssuesDialog({
  open,
  onClose,
  fileName,
  message,
  issues,
}: {
  open: boolean;
  onClose: () => void;
  fileName: string;
  message: string;
  issues: ImportIssue[];
}) {
  return (
    <Dialog
      open={open}
      onClose={onClose}
      title="This stack file cannot be imported"
      description={`${fileName}: ${message}`}
      footer={
        <Button onClick={onClose} data-autofocus>
          Close
        </Button>
      }
    >
      {issues.length ? (
        <ul className="max-h-72 space-y-1.5 overflow-y-auto text-xs" aria-label="Problems in the file">
          {issues.slice(0, 50).map((i, k) => (
            <li key={k} className="rounded border border-line bg-paper/60 px-2 py-1.5">
              {i.element ? <span className="mr-2 text-[11px] font-bold text-ink">{i.element}</span> : null}
              <span className="text-[11px] text-ink/60">{placeOf(i)}</span>
              <p className="mt-0.5 text-fail">{sentence(i.message)}</p>
            </li>
          ))}
          {issues.length > 50 ? <li className="text-ink/55">and {issues.length - 50} more</li> : null}
        </ul>
      ) : null}
    </Dialog>
  );
}
