/**
 * The thread that renders report files for ./report-renderer.ts, loaded from its plain-JS
 * bundle (backend/engine/bundle.mjs), so it starts without a TypeScript loader. Requests are
 * answered in the order asked; a file that fails to render answers with the error.
 */
import { parentPort } from "node:worker_threads";
import type { ReportContent, ReportFileKind } from "@shared/schemas/reports";
import type { ReportMeta } from "./report-pdf";
import { renderFile } from "./report-render";

export type ToRenderThread = { id: number; content: ReportContent; meta: ReportMeta; kind: ReportFileKind };
export type FromRenderThread = { id: number; data: Uint8Array } | { id: number; error: string };

const port = parentPort;
if (!port) throw new Error("backend/services/report-render-thread.ts must run as a worker thread");

port.on("message", async ({ id, content, meta, kind }: ToRenderThread) => {
  try {
    // a copy the size of the file: a Buffer may sit in a shared pool that must not be transferred
    const data = new Uint8Array(await renderFile(content, meta, kind));
    port.postMessage({ id, data } satisfies FromRenderThread, [data.buffer]);
  } catch (e) {
    port.postMessage({ id, error: e instanceof Error ? e.message : String(e) } satisfies FromRenderThread);
  }
});
