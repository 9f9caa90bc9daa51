/** "New stack from a template" (issue 14, item 2): the templates the server offers, one chosen, handed on whole. */
import { cleanup, fireEvent, screen, waitFor } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { STACK_TEMPLATES } from "@shared/stack-templates";
import { TemplateDialog } from "@frontend/features/revisions/components/template-dialog";
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
