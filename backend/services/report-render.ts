/**
 * One report file from a report's frozen content: PDF, spreadsheet or CSV. The server renders
 * them on a thread of their own (./report-renderer.ts); this is what that thread runs.
 */
import type { ReportContent, ReportFileKind } from "@shared/schemas/reports";
import { renderReportPdf, type ReportMeta } from "./report-pdf";
import { renderReportCsv, renderReportXlsx } from "./report-sheets";

export async function renderFile(content: ReportContent, meta: ReportMeta, kind: ReportFileKind): Promise<Buffer> {
  if (kind === "pdf") return renderReportPdf(content, meta);
  if (kind === "xlsx") return renderReportXlsx(content, meta);
  return renderReportCsv(content, meta);
}
