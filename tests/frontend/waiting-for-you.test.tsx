import { cleanup, screen, within } from "@testing-library/react";
import { afterEach, describe, expect, it } from "vitest";
import type { WorkItem } from "@shared/schemas/review-queue";
import { reviewSummary } from "@frontend/app/routes/app/home";
import { WaitingList } from "@frontend/features/review-queue";
import { renderWithApp } from "./helpers";

afterEach(cleanup);

const P = "0b6f2c1e-8a55-4d7e-9a51-3f0c6f1d2e77";
const item = (over: Partial<WorkItem>): WorkItem => ({
  kind: "revision.review",
  title: "Revision 3 of “Ridgeline”",
  projectId: P,
  projectName: "Ridgeline",
  link: `/projects/${P}/revisions/r3`,
  since: "2026-03-02T09:00:00.000Z",
  by: "Ezra Lindqvist",
  ...over,
});

describe("the home page's list of what waits", () => {
  it("groups by kind, links each item and its project, and says who put it there", () => {
    renderWithApp(
      <WaitingList
        items={[
          item({}),
          item({ kind: "report.release", title: "TR-0002 revision 1 for Larkfield Assembly", link: "/reports/x1", by: "Ines Ferro" }),
          item({ title: "Revision 4 of “Ridgeline”", link: `/projects/${P}/revisions/r4`, by: null }),
        ]}
      />,
    );
    const revisions = screen.getByRole("list", { name: "Revisions waiting for review" });
    const rows = within(revisions).getAllByRole("listitem");
    expect(rows).toHaveLength(2);
    expect(within(rows[0]).getByRole("link", { name: "Revision 3 of “Ridgeline”" }).getAttribute("href")).toBe(
      `/projects/${P}/revisions/r3`,
    );
    expect(within(rows[0]).getByRole("link", { name: "Ridgeline" }).getAttribute("href")).toBe(`/projects/${P}`);
    expect(rows[0].textContent).toContain("submitted by Ezra Lindqvist");
    expect(rows[1].textContent).not.toContain("by");

    const reports = screen.getByRole("list", { name: "Reports ready for release" });
    expect(within(reports).getByRole("link", { name: "TR-0002 revision 1 for Larkfield Assembly" }).getAttribute("href")).toBe(
      "/reports/x1",
    );
    expect(reports.textContent).toContain("built by Ines Ferro");
    expect(screen.queryByRole("list", { name: "Your revisions sent back" })).toBeNull();
  });

  it("shows an engineer's own returns and questions, and a calm line when nothing waits", () => {
    renderWithApp(
      <WaitingList
        items={[
          item({ kind: "revision.returned", by: "Ines Ferro" }),
          item({ kind: "report.question", title: "TR-0002 revision 1 for Larkfield Assembly", link: "/reports/x1", by: "Tomas Quill" }),
        ]}
      />,
    );
    expect(screen.getByRole("list", { name: "Your revisions sent back" }).textContent).toContain("sent back by Ines Ferro");
    expect(screen.getByRole("list", { name: "Supplier questions on your reports" }).textContent).toContain("asked by Tomas Quill");
    cleanup();
    renderWithApp(<WaitingList items={[]} />);
    expect(screen.getByText("Nothing waits for you")).toBeTruthy();
  });

  it("sums up for a reviewer what waits for review or release", () => {
    expect(reviewSummary([])).toBe("");
    expect(reviewSummary([item({ kind: "revision.returned" })])).toBe("");
    expect(reviewSummary([item({})])).toBe("1 revision waits for review.");
    expect(reviewSummary([item({}), item({}), item({ kind: "report.release" })])).toBe(
      "2 revisions and 1 report wait for review or release.",
    );
    expect(reviewSummary([item({ kind: "report.release" })])).toBe("1 report waits for release.");
  });
});
