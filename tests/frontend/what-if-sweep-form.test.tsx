/** The sweep form: its values and trials are checked before anything is sent, each message under its own field. */
import { cleanup, fireEvent, screen, waitFor } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { SweepPanel } from "@frontend/features/what-if/components/sweep-panel";
import { jsonResponse, mockFetch, renderWithApp } from "./helpers";

afterEach(() => {
  cleanup();
  vi.restoreAllMocks();
});

const read = (name: string) => JSON.parse(readFileSync(join(process.cwd(), "tests/fixtures", name), "utf8"));
const REV = "0b6f2c1e-8a55-4d7e-9a51-3f0c6f1d2e77";
const RUN = "5d1e0c7a-2b3f-4a6d-8e9c-1f2a3b4c5d6e";

describe("SweepPanel form", () => {
  it("names a bad values list and too few trials under their fields, sends nothing, then sends the parsed values", async () => {
    const fetchSpy = mockFetch(() => jsonResponse(201, { id: RUN }));
    const onRun = vi.fn();
    renderWithApp(
      <SweepPanel
        revisionId={REV}
        stack={read("stack-reference.json")}
        study={read("study-reference.json")}
        canRun
        runId={null}
        onRun={onRun}
      />,
    );
    const values = screen.getByLabelText("Values") as HTMLInputElement;
    const trials = screen.getByLabelText("Trials per point") as HTMLInputElement;
    fireEvent.change(values, { target: { value: "0.3" } });
    fireEvent.change(trials, { target: { value: "500" } });
    fireEvent.click(screen.getByRole("button", { name: "Run the sweep" }));

    const valuesMessage = await screen.findByText("Give at least 2 values");
    expect(values.getAttribute("aria-describedby")).toBe(valuesMessage.id);
    const trialsMessage = screen.getByText("Trials must be a whole number of at least 1,000");
    expect(trials.getAttribute("aria-describedby")).toBe(trialsMessage.id);
    expect(fetchSpy).not.toHaveBeenCalled();

    fireEvent.change(values, { target: { value: "0.3, 0.6; 0.9" } });
    fireEvent.change(trials, { target: { value: "4000" } });
    fireEvent.click(screen.getByRole("button", { name: "Run the sweep" }));
    await waitFor(() => expect(onRun).toHaveBeenCalledWith(RUN));
    const [url, init] = fetchSpy.mock.calls[0];
    expect(String(url)).toContain(`/api/revisions/${REV}/sweeps`);
    const body = JSON.parse(String((init as RequestInit).body));
    expect(body.values).toEqual([0.3, 0.6, 0.9]);
    expect(body.study.trials).toBe(4000);
    expect(screen.queryByText("Give at least 2 values")).toBeNull();
  });

  it("shows a refusal of the server with each place in words, not the API's paths", async () => {
    mockFetch(() =>
      jsonResponse(400, {
        error: {
          code: "invalid_body",
          message: "The sweep was refused.",
          fields: [
            { path: "values.1", message: "must be between 0 and 90" },
            { path: "study.tilts[0].pitchDeg", message: "must be a number" },
          ],
        },
      }),
    );
    renderWithApp(
      <SweepPanel
        revisionId={REV}
        stack={read("stack-reference.json")}
        study={read("study-reference.json")}
        canRun
        runId={null}
        onRun={() => undefined}
      />,
    );
    fireEvent.click(screen.getByRole("button", { name: "Run the sweep" }));
    const alert = await screen.findByText(/The sweep was refused\./);
    const text = alert.textContent ?? "";
    expect(text).toContain("Value 2: must be between 0 and 90");
    expect(text).toContain("Attitude 1: pitch (°): must be a number");
    expect(text).not.toMatch(/values\.1|study\.|tilts\[|pitchDeg/);
  });
});
