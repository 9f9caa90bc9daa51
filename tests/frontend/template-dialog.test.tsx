/** "New stack from a template" (issue 14, item 2): the templates the server offers, one chosen, handed on whole. */
import { useMemo, type ReactNode } from "react";
import { act, cleanup, fireEvent, screen, waitFor } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { STACK_TEMPLATES } from "@shared/stack-templates";
import type { Revision } from "@shared/schemas/revisions";
import type { StackFile } from "@shared/schemas/stack-file";
import reference from "../fixtures/stack-reference.json" with { type: "json" };
import { TemplateDialog } from "@frontend/features/revisions/components/template-dialog";
import { EditorContext, type EditorApi } from "@frontend/features/stack-editor/components/editor-context";
import { StackFileActions } from "@frontend/features/stack-editor/components/stack-file-actions";
import { useEditorHistory } from "@frontend/features/stack-editor/hooks/use-editor-history";
import { indexIssues, validateDoc } from "@frontend/features/stack-editor/lib/issues";
import type { EditorDoc } from "@frontend/features/stack-editor/lib/stack-ops";
import { jsonResponse, mockFetch, renderWithApp } from "./helpers";

afterEach(() => {
  cleanup();
  vi.restoreAllMocks();
});

describe("TemplateDialog", () => {
  it("lists the server's templates and hands the chosen one on with its stack and requirements", async () => {
    const calls: string[] = [];
    mockFetch(({ url }) => {
      calls.push(url);
      return jsonResponse(200, { templates: JSON.parse(JSON.stringify(STACK_TEMPLATES)) });
    });
    const onChoose = vi.fn();
    renderWithApp(<TemplateDialog open onClose={() => undefined} onChoose={onChoose} pending={false} />);
    const options = await screen.findAllByRole("radio");
    expect(options).toHaveLength(STACK_TEMPLATES.length);
    expect(calls).toEqual(["/api/stack-templates"]);
    // the first is chosen until another is
    expect(options[0].getAttribute("aria-checked")).toBe("true");
    fireEvent.click(screen.getByRole("radio", { name: /Dies side by side on a substrate/ }));
    expect(screen.getByRole("radio", { name: /Dies side by side/ }).getAttribute("aria-checked")).toBe("true");
    fireEvent.click(screen.getByRole("button", { name: "Start from this template" }));
    await waitFor(() => expect(onChoose).toHaveBeenCalledTimes(1));
    const chosen = onChoose.mock.calls[0][0];
    expect(chosen.id).toBe("dies-side-by-side");
    expect(chosen.stack).toEqual(JSON.parse(JSON.stringify(STACK_TEMPLATES[1].stack)));
    expect(chosen.requirements).toEqual(STACK_TEMPLATES[1].requirements);
  });
});

let latest: EditorDoc;
let undoLatest: () => void;
function Harness({ initial, children }: { initial: EditorDoc; children: ReactNode }) {
  const { doc, update, setAt, undo } = useEditorHistory(initial);
  const issues = useMemo(() => indexIssues(validateDoc(doc)), [doc]);
  latest = doc;
  undoLatest = undo;
  const api: EditorApi = {
    doc,
    readOnly: false,
    issues,
    update,
    setAt,
    selectedId: null,
    select: () => undefined,
    suppliers: [],
    warnings: new Map(),
  };
  return <EditorContext.Provider value={api}>{children}</EditorContext.Provider>;
}

describe("New stack from a template, in the editor", () => {
  it("replaces the draft's stack and requirements with the template's, keeping the stack's name; undo brings them back", async () => {
    mockFetch(() => jsonResponse(200, { templates: JSON.parse(JSON.stringify(STACK_TEMPLATES)) }));
    const before: EditorDoc = {
      stack: { ...(structuredClone(reference) as unknown as StackFile), name: "Our package" },
      requirements: [{ metric: "heading.maxAbsDeg", max: 3, yield: 0.99 }],
    };
    renderWithApp(
      <Harness initial={before}>
        <StackFileActions revision={{ number: 3 } as Revision} readOnly={false} />
      </Harness>,
    );
    fireEvent.click(screen.getByRole("button", { name: "Template…" }));
    fireEvent.click(await screen.findByRole("radio", { name: /Dies side by side on a substrate/ }));
    fireEvent.click(screen.getByRole("button", { name: "Start from this template" }));
    const tpl = STACK_TEMPLATES.find((t) => t.id === "dies-side-by-side")!;
    await waitFor(() => expect(latest.stack.elements.map((e) => e.id)).toEqual(tpl.stack.elements.map((e) => e.id)));
    expect(latest.stack.name).toBe("Our package");
    expect(latest.requirements).toEqual(tpl.requirements);
    act(() => undoLatest());
    expect(latest).toEqual(before);
  });
});
