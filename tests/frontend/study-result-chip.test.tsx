import { cleanup, render, screen } from "@testing-library/react";
import { afterEach, describe, expect, it } from "vitest";
import { StudyResultChip } from "@frontend/features/projects/components/study-result-chip";

afterEach(cleanup);

const study = (status: string, passes: boolean | null) => ({
  id: "0b6f2c1e-8a55-4d7e-9a51-3f0c6f1d2e77",
  status,
  passes,
  finishedAt: passes === null ? null : "2026-01-05T10:00:00.000Z",
});

describe("StudyResultChip", () => {
  it.each([
    [null, "No study yet"],
    [study("finished", true), "Pass"],
    [study("finished", false), "Fail"],
    [study("running", null), "Running"],
    // A crashed run must not read as a failed package.
    [study("failed", null), "Run failed"],
  ])("shows %o as %s", (value, label) => {
    render(<StudyResultChip study={value} />);
    expect(screen.getByText(label)).toBeTruthy();
  });
});
