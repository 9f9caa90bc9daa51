/**
 * Pages under an archived project offer no change (issue 10 item 4, with issue 11's archive): the
 * server refuses every write under it, so the study page shows no run again, new study or cancel,
 * the data-set page no delete, run as built or mapping, and each says why, as the stack editor
 * does. The same pages of an open project offer them.
 */
import { QueryClientProvider } from "@tanstack/react-query";
import { cleanup, render, screen } from "@testing-library/react";
import { createMemoryRouter, RouterProvider } from "react-router";
import { afterEach, describe, expect, it, vi } from "vitest";
import type { Me, Project } from "@shared/schemas/api";
import type { Dataset } from "@shared/schemas/datasets";
import type { Study } from "@shared/schemas/studies";
import { DatasetRoute } from "@frontend/app/routes/app/dataset";
import { StudyRoute } from "@frontend/app/routes/app/study";
import { datasetQueryOptions } from "@frontend/features/datasets/api/get-dataset";
import { authKeys } from "@frontend/features/auth/api/keys";
import { projectQueryOptions } from "@frontend/features/projects/api/get-project";
import { studyQueryOptions } from "@frontend/features/studies/api/get-study";
import { createQueryClient } from "@frontend/lib/query-client";
import stackFile from "../fixtures/stack-reference.json" with { type: "json" };
import studyFile from "../fixtures/study-reference.json" with { type: "json" };
import { jsonResponse, mockFetch } from "./helpers";

const PROJECT: Project = {
  id: "0b6f2c1e-8a55-4d7e-9a51-3f0c6f1d2e77",
  name: "Ridgeline watch module, rev C",
  description: "",
  ownerId: "u1",
  ownerName: "Ezra Lindqvist",
  createdAt: "2026-01-05T10:00:00.000Z",
  updatedAt: "2026-01-05T10:00:00.000Z",
  archivedAt: null,
  version: 3,
  lastStudy: null,
};
const ENGINEER: Me = {
  user: { id: "u1", name: "Ezra Lindqvist", email: "engineer@example.com" },
  role: "engineer",
  workspace: { id: "5c0a7e21-9d3b-4f6e-8a12-7b4c2d1e0f93", name: "Workspace" },
  supplierId: null,
};
const FAILED: Study = {
  id: "6a1d9c53-2b4e-4f0a-8e77-0c2d4b1a9f10",
  projectId: PROJECT.id,
  revisionId: "9d0e5f7a-3c21-4b8e-a6d4-5e2f1c0b7a33",
  revisionNumber: 2,
  number: 4,
  label: "",
  status: "failed",
  progress: { done: 0, total: 1000, trialsPerSecond: null },
  trials: 1000,
  seed: 7,
  passes: null,
  error: "the engine stopped",
  createdByName: "Ezra Lindqvist",
  createdAt: "2026-01-06T10:00:00.000Z",
  startedAt: null,
  finishedAt: null,
  asBuilt: [],
  study: studyFile as Study["study"],
  stack: stackFile as Study["stack"],
  site: null,
  result: null,
};

const DATASET: Dataset = {
  id: "22222222-2222-4222-8222-222222222222",
  projectId: PROJECT.id,
  name: "mag-corners.csv",
  fileType: "csv",
  sheet: null,
  sizeBytes: 900,
  rows: 30,
  columnCount: 2,
  mappedColumns: [],
  uploadedByName: "Ezra Lindqvist",
  uploadedByRole: "engineer",
  supplierName: null,
  report: null,
  lot: null,
  note: null,
  lotColumn: null,
  version: 3,
  createdAt: "2026-01-05T10:00:00.000Z",
  columns: [
    { key: "lot", name: "lot", letter: "A", unit: null, kind: "label", summary: null, mapping: null },
    { key: "h0", name: "h0", letter: "B", unit: "um", kind: "number", summary: null, mapping: null },
  ],
  pooled: [],
  preview: { rowNumbers: [], cells: [] },
  sha256: "0".repeat(64),
};

afterEach(() => {
  cleanup();
  vi.restoreAllMocks();
});

/** A page as the router shows it, with what its loader would have read already in the cache. */
async function page(project: Project, which: "study" | "dataset") {
  // nothing is written from here: any call these pages make is a read
  const calls: string[] = [];
  mockFetch(({ url, method }) => {
    calls.push(`${method} ${url}`);
    if (url === `/api/projects/${project.id}/revisions`) return jsonResponse(200, { revisions: [] });
    return jsonResponse(404, { error: { code: "not_found", message: "not in this test" } });
  });
  const queryClient = createQueryClient();
  queryClient.setQueryData(authKeys.me(), ENGINEER);
  queryClient.setQueryData(projectQueryOptions(project.id).queryKey, project);
  queryClient.setQueryData(studyQueryOptions(FAILED.id).queryKey, FAILED);
  queryClient.setQueryData(datasetQueryOptions(DATASET.id).queryKey, DATASET);
  const router = createMemoryRouter(
    [
      { path: "/projects/:id/studies/:studyId", element: <StudyRoute /> },
      { path: "/projects/:id/datasets/:datasetId", element: <DatasetRoute /> },
    ],
    {
      initialEntries: [
        which === "study" ? `/projects/${project.id}/studies/${FAILED.id}` : `/projects/${project.id}/datasets/${DATASET.id}`,
      ],
    },
  );
  render(
    <QueryClientProvider client={queryClient}>
      <RouterProvider router={router} />
    </QueryClientProvider>,
  );
  await screen.findByRole("heading", { name: which === "study" ? /Study 4/ : DATASET.name });
  return calls;
}
const studyPage = (project: Project) => page(project, "study");
const ARCHIVED: Project = { ...PROJECT, archivedAt: "2026-02-01T09:00:00.000Z" };

const offered = () => [...screen.queryAllByRole("button"), ...screen.queryAllByRole("link")].map((b) => b.textContent ?? "");

describe("the study page of an archived project", () => {
  it("an open project's failed study offers to run it again and to start a new study from it", async () => {
    await studyPage(PROJECT);
    expect(offered()).toEqual(expect.arrayContaining(["Run again", "New study from these settings"]));
    expect(screen.queryByText(/is archived: read only/)).toBeNull();
  });

  it("an archived project's offers neither, and says the project is archived", async () => {
    const calls = await studyPage(ARCHIVED);
    expect(offered()).not.toContain("Run again");
    expect(offered()).not.toContain("New study from these settings");
    // reading is untouched
    expect(offered()).toEqual(expect.arrayContaining(["Compare", "What if…"]));
    expect(screen.getByText(`The project “${PROJECT.name}” is archived: read only`)).toBeTruthy();
    expect(calls.filter((c) => !c.startsWith("GET "))).toEqual([]);
  });
});

describe("the data-set page of an archived project", () => {
  it("an open project's offers delete and run as built", async () => {
    await page(PROJECT, "dataset");
    expect(offered()).toEqual(expect.arrayContaining(["Delete", "Run as built"]));
    expect((screen.getByRole("combobox", { name: "Lot column" }) as HTMLSelectElement).disabled).toBe(false);
    expect(screen.queryByText(/is archived: read only/)).toBeNull();
  });

  it("an archived project's offers neither, nor a change of its mapping, and says the project is archived", async () => {
    const calls = await page(ARCHIVED, "dataset");
    expect(offered()).not.toContain("Delete");
    expect(offered()).not.toContain("Run as built");
    expect(offered()).toContain("Download original");
    expect(screen.getByText(`The project “${PROJECT.name}” is archived: read only`)).toBeTruthy();
    // the lot column cannot be chosen
    expect((screen.getByRole("combobox", { name: "Lot column" }) as HTMLSelectElement).disabled).toBe(true);
    expect(calls.filter((c) => !c.startsWith("GET "))).toEqual([]);
  });
});
