import type { ReportFileKind } from "@shared/schemas/reports";

/** Same-origin address of a report file; the browser sends the session cookie with it. */
export const reportFileHref = (id: string, kind: ReportFileKind) => `/api/reports/${encodeURIComponent(id)}/${kind}`;

export const FILE_LABEL: Record<ReportFileKind, string> = { pdf: "PDF", xlsx: "Spreadsheet", csv: "CSV" };

/** Reads a picked PNG file as a data URL for the report's 3D snapshot. */
export function readPng(file: File): Promise<string> {
  return new Promise((resolve, reject) => {
    if (file.type !== "image/png") {
      reject(new Error("Choose a PNG image (the 3D view's Save picture makes one)."));
      return;
    }
    const reader = new FileReader();
    reader.onload = () => resolve(String(reader.result));
    reader.onerror = () => reject(new Error("The image could not be read."));
    reader.readAsDataURL(file);
  });
}
