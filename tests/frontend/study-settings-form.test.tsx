import { cleanup, fireEvent, render, screen, waitFor, within } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import stack from "../../backend/demo/ridgeline-stack.json";
import { SettingsCalibrationPanel } from "@frontend/features/studies/components/settings-calibration-panel";
import { StudySettingsForm } from "@frontend/features/studies/components/study-settings-form";
import { buildStudy, defaultFormValues, formValuesFromStudy, issuesToErrors } from "@frontend/features/studies/lib/study-form";
import type { StackFile } from "@shared/schemas/stack-file";
import { typicalOf } from "@shared/typical-tolerances";
import { jsonResponse, mockFetch, renderWithApp } from "./helpers";

afterEach(() => {
  cleanup();
  vi.restoreAllMocks();
});

const PROJECT = "0b6f2c1e-8a55-4d7e-9a51-3f0c6f1d2e77";
const REV = "9ee0e65a-0fc1-47e8-97d7-7dccbb3f8cd8";
const STUDY = "317dfb27-ead0-4805-a25c-e268257d9a7e";
const REQUIREMENTS = [
  { metric: "heading.maxAbsDeg", max: 2, yield: 0.99 },
  { metric: "mag.crossAxisTotalPct.x", max: 2, yield: 0.9973 },
];
const summary = {
  id: REV,
  projectId: PROJECT,
  number: 1,
  status: "approved" as const,
  name: "Ridgeline 9-axis module",
  note: "Baseline",
  basedOnId: null,
  version: 1,
  createdByName: "Ezra Lindqvist",
  approvedByName: "Rana Haddad",
  createdAt: "2026-01-05T10:00:00.000Z",
  updatedAt: "2026-01-05T10:00:00.000Z",
  submittedAt: null,
  approvedAt: null,
};
const revision = { ...summary, stack, requirements: REQUIREMENTS, comments: [], warnings: [] };
const field = {
  site: { latitudeDeg: 47.27, longitudeDeg: 11.39, altitudeKm: 0.6, date: "2026-06-01" },
  model: "WMM-2025",
  inclinationDeg: 63.623207767644246,
  declinationDeg: 4.217403444874641,
  totalIntensityNt: 48537.99,
  horizontalIntensityNt: 21564.08,
};
const queued = {
  id: STUDY,
  projectId: PROJECT,
  revisionId: REV,
  revisionNumber: 1,
  number: 2,
  label: "",
  status: "queued",
  progress: { done: 0, total: 20000, trialsPerSecond: null },
  trials: 20000,
  seed: 5,
  passes: null,
  error: null,
  createdByName: "Ezra Lindqvist",
  createdAt: "2026-01-05T10:00:00.000Z",
  startedAt: null,
  finishedAt: null,
  asBuilt: [],
};

// the workspace's budget and the pace of its finished studies: 1.8·10^6 compass evaluations per second
const BUDGET = { budget: 2e9, defaultBudget: 2e9, maxBudget: 2e11, workPerSecond: 1_800_000, measuredStudies: 3 };

function renderForm(onStarted = vi.fn(), canSetBudget = false) {
  renderWithApp(
    <StudySettingsForm
      revisions={[summary]}
      initialRevisionId={REV}
      initialValues={{ ...defaultFormValues(5), trials: "20000" }}
      canSetBudget={canSetBudget}
      onStarted={onStarted}
    />,
  );
  return onStarted;
}

describe("the study settings form", () => {
  it("shows the revision's requirements and, for a site, the field the WMM finds; the site goes to the server", async () => {
    const calls = mockFetch(({ url, method }) => {
      if (url === `/api/revisions/${REV}`) return jsonResponse(200, revision);
      if (url === "/api/workspace/study-budget") return jsonResponse(200, BUDGET);
      if (url.startsWith("/api/geomagnetic-field?")) return jsonResponse(200, field);
      if (method === "POST") return jsonResponse(202, queued);
      return jsonResponse(404, { error: { code: "not_found", message: "no" } });
    });
    const onStarted = renderForm();

    // the first render parses the revision (stack file and all) cold; on a loaded machine that passed the 1 s default
    const reqTable = await screen.findByRole("table", { name: "Requirements of the revision" }, { timeout: 5000 });
    expect(within(reqTable).getByText("heading.maxAbsDeg")).toBeTruthy();
    expect(within(reqTable).getByText("≤ 2.00° (34.9 mrad)")).toBeTruthy();
    expect(within(reqTable).getByText("99.73 %")).toBeTruthy();
    // 20,000 trials × 180 attitudes at the workspace's 1.8·10^6 per second
    expect(await screen.findByText("about 2 s")).toBeTruthy();

    fireEvent.click(screen.getByText("From a site (WMM2025)"));
    fireEvent.change(screen.getByLabelText("Latitude"), { target: { value: "47.27" } });
    fireEvent.change(screen.getByLabelText("Longitude"), { target: { value: "11.39" } });
    fireEvent.change(screen.getByLabelText("Altitude"), { target: { value: "0.6" } });
    fireEvent.change(screen.getByLabelText("Date"), { target: { value: "2026-06-01" } });
    const found = screen.getByLabelText("Field at the site");
    await waitFor(() => expect(within(found).getByText("63.623°")).toBeTruthy());
    expect(within(found).getByText("4.217°")).toBeTruthy();
    expect(within(found).getByText("48,538 nT")).toBeTruthy();
    const lookup = calls.mock.calls.map((c) => String(c[0])).find((u) => u.includes("geomagnetic-field"))!;
    expect(lookup).toContain("latitudeDeg=47.27");
    expect(lookup).toContain("date=2026-06-01");

    fireEvent.click(screen.getByText("Start study"));
    await waitFor(() => expect(onStarted).toHaveBeenCalled());
    const post = calls.mock.calls.find((c) => (c[1] as RequestInit | undefined)?.method === "POST")!;
    expect(String(post[0])).toBe(`/api/revisions/${REV}/studies`);
    const body = JSON.parse(String((post[1] as RequestInit).body));
    expect(body.site).toEqual({ latitudeDeg: 47.27, longitudeDeg: 11.39, altitudeKm: 0.6, date: "2026-06-01" });
    expect(body.study).toMatchObject({
      format: "orthostack.study/1",
      trials: 20000,
      seed: 5,
      inclinationDeg: 63.6232,
      headingStepDeg: 10,
      sampling: "random",
    });
    // The revision's requirements apply on the server.
    expect(body.study.requirements).toBeUndefined();
    expect(body.study.tilts).toHaveLength(5);
  }, 20_000);

  it("stops a bad value in the browser, and puts the server's field messages next to the fields", async () => {
    const calls = mockFetch(({ url, method }) => {
      if (url === `/api/revisions/${REV}`) return jsonResponse(200, revision);
      if (url === "/api/workspace/study-budget") return jsonResponse(200, BUDGET);
      if (method === "POST")
        return jsonResponse(400, {
          error: {
            code: "invalid_study",
            message: "The study file has a problem; nothing was queued.",
            fields: [{ path: "study.headingStepDeg", message: "the sweep would have 36000 attitudes" }],
          },
        });
      return jsonResponse(404, { error: { code: "not_found", message: "no" } });
    });
    renderForm();
    await screen.findByRole("table", { name: "Requirements of the revision" });

    fireEvent.change(screen.getByLabelText("Trials"), { target: { value: "twenty" } });
    fireEvent.click(screen.getByText("Start study"));
    expect(await screen.findByText("Trials must be a whole number")).toBeTruthy();
    expect(calls.mock.calls.some((c) => (c[1] as RequestInit | undefined)?.method === "POST")).toBe(false);

    fireEvent.change(screen.getByLabelText("Trials"), { target: { value: "20,000" } });
    fireEvent.click(screen.getByText("Start study"));
    expect(await screen.findByText("The sweep would have 36000 attitudes")).toBeTruthy();
  }, 20_000);
});

describe("the work budget in the study settings", () => {
  it("warns before queueing a study past the budget, the time it would take included; an admin can raise it there", async () => {
    const calls = mockFetch(({ url, method, body }) => {
      if (url === `/api/revisions/${REV}`) return jsonResponse(200, revision);
      if (url === "/api/workspace/study-budget")
        return jsonResponse(200, method === "PATCH" ? { ...BUDGET, budget: (body as { budget: number }).budget } : BUDGET);
      return jsonResponse(404, { error: { code: "not_found", message: "no" } });
    });
    renderForm(vi.fn(), true);
    await screen.findByRole("table", { name: "Requirements of the revision" });
    // 10^7 trials at a 0.1° step: 3,600 headings × 5 tilts
    fireEvent.change(screen.getByLabelText("Trials"), { target: { value: "10000000" } });
    fireEvent.change(screen.getByLabelText(/Heading step/), { target: { value: "0.1" } });
    expect(await screen.findByText(/asks for 180,000,000,000 compass evaluations, more than the 2,000,000,000/)).toBeTruthy();
    // 1.8·10^11 at 1.8·10^6 per second: 10^5 s
    expect(screen.getByText("about 27 h 46 min")).toBeTruthy();

    fireEvent.click(screen.getByText("Set"));
    await waitFor(() => expect(calls.mock.calls.some((c) => (c[1] as RequestInit | undefined)?.method === "PATCH")).toBe(true));
    const patch = calls.mock.calls.find((c) => (c[1] as RequestInit | undefined)?.method === "PATCH")!;
    expect(JSON.parse(String((patch[1] as RequestInit).body))).toEqual({ budget: 180_000_000_000 });
    await waitFor(() => expect(screen.queryByText(/more than the 2,000,000,000/)).toBeNull());
  }, 20_000);

  it("a person who may not set it is told to ask an admin, and sees no control", async () => {
    mockFetch(({ url }) => {
      if (url === `/api/revisions/${REV}`) return jsonResponse(200, revision);
      if (url === "/api/workspace/study-budget") return jsonResponse(200, BUDGET);
      return jsonResponse(404, { error: { code: "not_found", message: "no" } });
    });
    renderForm();
    await screen.findByRole("table", { name: "Requirements of the revision" });
    fireEvent.change(screen.getByLabelText("Trials"), { target: { value: "10000000" } });
    fireEvent.change(screen.getByLabelText(/Heading step/), { target: { value: "0.1" } });
    expect(await screen.findByText(/ask an admin to raise the budget/)).toBeTruthy();
    expect(screen.queryByText("Set")).toBeNull();
  }, 20_000);
});

describe("the study file the form makes", () => {
  const s = stack as unknown as StackFile;

  it("calibration with a residual, Latin hypercube and adaptive stopping", () => {
    const v = {
      ...defaultFormValues(11),
      trials: "1000000",
      sampling: "lhs" as const,
      adaptive: true,
      calibrationAfter: "board" as const,
      residualTol: "0.05",
      residualSigmas: "2",
    };
    const built = buildStudy(v, s);
    expect(built.ok).toBe(true);
    if (!built.ok) return;
    expect(built.study).toMatchObject({
      trials: 1_000_000,
      sampling: "lhs",
      adaptive: { significantDigits: 2 },
      calibration: { after: "board", residualDeg: { dist: "normal", tol: 0.05, sigmas: 2 } },
      inclinationDeg: 60,
    });
    expect(built.attitudes).toBe(180);
  });

  it("names the tilt that is wrong and a metric the stack lacks", () => {
    const v = defaultFormValues(1);
    v.tilts = [...v.tilts, { pitchDeg: "95", rollDeg: "0" }];
    const bad = buildStudy(v, s);
    expect(bad.ok).toBe(false);
    if (!bad.ok) expect(bad.errors["tilts.5.pitchDeg"]).toMatch(/strictly between -90 and 90/);
    expect(
      issuesToErrors([
        { path: "study.tilts[2].rollDeg", message: "x" },
        { path: "site.date", message: "y" },
        { path: "study.requirements[0].metric", message: "z" },
      ]),
    ).toEqual({
      "tilts.2.rollDeg": "x",
      date: "y",
      _form: "z",
    });
  });

  it("goes back from a stored study to the same file", () => {
    const v = {
      ...defaultFormValues(77),
      trials: "50000",
      calibrationAfter: "package" as const,
      residualDist: "uniform" as const,
      residualTol: "0.1",
      headingStepDeg: "15",
    };
    v.tilts = [
      { pitchDeg: "0", rollDeg: "0" },
      { pitchDeg: "20", rollDeg: "-10" },
    ];
    const first = buildStudy(v, s);
    expect(first.ok).toBe(true);
    if (!first.ok) return;
    const again = buildStudy(formValuesFromStudy(first.study, null), s);
    expect(again.ok && again.study).toEqual(first.study);
  });
});

describe("the calibration residual", () => {
  it("starts from the typical residual, never ±0, and shows it beside the field", () => {
    const typical = typicalOf("calibration.residualDeg", "calibration")!;
    const v = { ...defaultFormValues(5), calibrationAfter: "package" as const };
    expect(Number(v.residualTol)).toBe(typical.tol);
    expect(v.residualDist).toBe(typical.dist);
    render(<SettingsCalibrationPanel v={{ ...v, residualTol: "0.2" }} set={() => undefined} errors={{}} />);
    expect(screen.getByText(/typical ±0\.05° \(common practice\)/)).toBeTruthy();
  });
});
