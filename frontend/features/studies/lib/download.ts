import * as z from "zod";
import { api } from "@frontend/lib/api-client";
import { downloadBlob } from "@frontend/lib/download";

const slug = (s: string) =>
  s
    .normalize("NFKD")
    .replace(/[^\w.-]+/g, "-")
    .replace(/^-+|-+$/g, "")
    .slice(0, 60)
    .toLowerCase() || "study";

/** What a study's files are named after: `<project>-study-<n>` (the result file, its charts). */
export function studyFileBase(projectName: string, studyNumber: number): string {
  return `${slug(projectName)}-study-${studyNumber}`;
}

/** The result file name: `<project>-study-<n>.result.json`. */
export function resultFileName(projectName: string, studyNumber: number): string {
  return `${studyFileBase(projectName, studyNumber)}.result.json`;
}

// Every key of the stored file, not only those the client's schema reads.
const RawResultSchema = z.object({ result: z.record(z.string(), z.unknown()) });

/** Saves the result file (MODEL.md §11) as the server stored it. */
export async function downloadResultFile(studyId: string, projectName: string, studyNumber: number) {
  const { result } = await api.get(`/api/studies/${encodeURIComponent(studyId)}`, RawResultSchema);
  downloadBlob(new Blob([JSON.stringify(result, null, 2) + "\n"], { type: "application/json" }), resultFileName(projectName, studyNumber));
}
