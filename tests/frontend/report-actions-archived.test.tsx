import { cleanup, render, renderHook, screen } from "@testing-library/react";
import { afterEach, describe, expect, it } from "vitest";
import type { Role } from "@shared/schemas/common";
import type { Report } from "@shared/schemas/reports";
import { useReportActions } from "@frontend/features/reports/hooks/use-report-actions";

afterEach(cleanup);

/** The buttons offered: the hook reads only the report's state, so the rest of the report is left out. */
function buttons(state: Pick<Report, "status" | "isLatest" | "acknowledgedAt">, role: Role, archived: boolean): string[] {
  const { result } = renderHook(() => useReportActions(state as Report, role, archived));
  render(<>{result.current.actions}</>);
  const names = screen.queryAllByRole("button").map((b) => b.textContent ?? "");
  cleanup();
  return names;
}

const DRAFT = { status: "draft", isLatest: true, acknowledgedAt: null } as const;
const RELEASED = { status: "released", isLatest: true, acknowledgedAt: null } as const;

describe("the report's buttons when its project is archived", () => {
  it("offer no change, release or send-back of a draft", () => {
    expect(buttons(DRAFT, "admin", false)).toEqual(["Change", "Discard", "Send back", "Release"]);
    expect(buttons(DRAFT, "admin", true)).toEqual([]);
    expect(buttons(DRAFT, "reviewer", true)).toEqual([]);
  });

  it("still offer sending a released report, but no new revision of it", () => {
    expect(buttons(RELEASED, "engineer", false)).toEqual(["New revision", "Send to supplier"]);
    expect(buttons(RELEASED, "engineer", true)).toEqual(["Send to supplier"]);
    // the supplier's acknowledgement is theirs, archive or not
    expect(buttons(RELEASED, "supplier", true)).toEqual(["Acknowledge"]);
  });
});
