import { useRef, useState } from "react";
import type { Revision } from "@shared/schemas/revisions";
import { Button } from "@frontend/components/ui/button";
import {
  ImportIssuesDialog,
  MAX_IMPORT_BYTES,
  readStackFileText,
  stackFileName,
  stackFileText,
  type ImportIssue,
} from "@frontend/features/stack-files";
import { TemplateDialog } from "@frontend/features/revisions";
import { downloadBlob } from "@frontend/lib/download";
import { validateStackFile } from "@shared/schemas/stack-file";
import { useEditor } from "./editor-context";

const ImportIcon = () => (
  <svg
    width="14"
    height="14"
    viewBox="0 0 16 16"
    fill="none"
    stroke="currentColor"
    strokeWidth="1.5"
    strokeLinecap="round"
    strokeLinejoin="round"
    aria-hidden="true"
  >
    <path d="M8 2v8M5 7l3 3 3-3M2.5 11v2.5h11V11" />
  </svg>
);
const ExportIcon = () => (
  <svg
    width="14"
    height="14"
    viewBox="0 0 16 16"
    fill="none"
    stroke="currentColor"
    strokeWidth="1.5"
    strokeLinecap="round"
    strokeLinejoin="round"
    aria-hidden="true"
  >
    <path d="M8 10V2M5 5l3-3 3 3M2.5 11v2.5h11V11" />
  </svg>
);

/**
 * Import replaces the draft's stack (one undo step), so does a template (its requirements
 * too; the stack keeps its name); export downloads what is on screen.
 */
export function StackFileActions({ revision, readOnly }: { revision: Revision; readOnly: boolean }) {
  const { doc, update } = useEditor();
  const input = useRef<HTMLInputElement>(null);
  const [refused, setRefused] = useState<{ fileName: string; message: string; issues: ImportIssue[] } | null>(null);
  const [templatesOpen, setTemplatesOpen] = useState(false);

  async function onFile(file: File) {
    if (file.size > MAX_IMPORT_BYTES) {
      setRefused({ fileName: file.name, message: "the file is larger than 20 MB", issues: [] });
      return;
    }
    const r = readStackFileText(await file.text());
    if (!r.ok) {
      setRefused({ fileName: file.name, message: r.message, issues: r.issues });
      return;
    }
    update((d) => ({ ...d, stack: r.stack }), "import");
  }

  return (
    <>
      {readOnly ? null : (
        <>
          <input
            ref={input}
            type="file"
            accept=".json,application/json"
            className="sr-only"
            tabIndex={-1}
            aria-label="Stack file to import"
            data-testid="import-stack-file"
            onChange={(e) => {
              const f = e.target.files?.[0];
              e.target.value = "";
              if (f) void onFile(f);
            }}
          />
          <Button
            size="sm"
            icon={<ImportIcon />}
            onClick={() => input.current?.click()}
            title="Replace this draft's stack with a stack file (undo restores it)"
          >
            Import
          </Button>
          <Button
            size="sm"
            onClick={() => setTemplatesOpen(true)}
            title="Replace this draft's stack and requirements with a template's (undo restores them)"
          >
            Template…
          </Button>
          <TemplateDialog
            open={templatesOpen}
            onClose={() => setTemplatesOpen(false)}
            pending={false}
            onChoose={(t) => {
              // the server's templates are valid stacks (tests/backend/stack-help.test.ts); checked here all the same
              const v = validateStackFile(t.stack);
              if (!v.ok) return;
              update((d) => ({ stack: { ...v.stack, name: d.stack.name || v.stack.name }, requirements: t.requirements }), "template");
              setTemplatesOpen(false);
            }}
          />
        </>
      )}
      <Button
        size="sm"
        icon={<ExportIcon />}
        onClick={() =>
          downloadBlob(new Blob([stackFileText(doc.stack)], { type: "application/json" }), stackFileName(doc.stack.name, revision.number))
        }
        title="Download the stack file shown here"
      >
        Export
      </Button>
      {refused ? <ImportIssuesDialog open onClose={() => setRefused(null)} {...refused} /> : null}
    </>
  );
}
