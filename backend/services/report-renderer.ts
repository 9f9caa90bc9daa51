/**
 * Report files are rendered on a thread of their own, not on the thread that answers requests:
 * a report's PDF took 0.25-0.5 s of CPU once warm and 1.4 s the first time (fonts, charts), and
 * every other request waited that long. One thread, started at the first file asked for,
 * replaced when it dies (the files it owed fail with a message, and the next file starts a new
 * one); the thread renders exactly what ./report-render.ts renders in process.
 */
import { pathToFileURL } from "node:url";
import { Worker } from "node:worker_threads";
import type { ReportContent, ReportFileKind } from "@shared/schemas/reports";
import { ensureBundle } from "../engine/bundle.mjs";
import type { ReportMeta } from "./report-pdf";
import type { FromRenderThread, ToRenderThread } from "./report-render-thread";

type Pending = { resolve: (b: Buffer) => void; reject: (e: Error) => void };

export class ReportRenderer {
  private thread: Worker | null = null;
  private pending = new Map<number, Pending>();
  private nextId = 1;
  private stopped = false;

  /** the thread's bundle, built (when stale) at start rather than while someone waits for a file */
  private readonly url = pathToFileURL(ensureBundle("report"));

  constructor(private readonly log?: (message: string, err?: unknown) => void) {}

  /** The file's bytes; rejects when the file cannot be rendered or the renderer is stopped. */
  render(content: ReportContent, meta: ReportMeta, kind: ReportFileKind): Promise<Buffer> {
    if (this.stopped) return Promise.reject(new Error("the report renderer is stopped"));
    const id = this.nextId++;
    return new Promise<Buffer>((resolve, reject) => {
      const thread = this.start();
      this.pending.set(id, { resolve, reject });
      thread.postMessage({ id, content, meta, kind } satisfies ToRenderThread);
    });
  }

  /** The thread, for tests that stop it to see the renderer recover (null before the first file). */
  threadForTest(): Worker | null {
    return this.thread;
  }

  async stop(): Promise<void> {
    this.stopped = true;
    const t = this.thread;
    this.thread = null;
    this.failAll("the report renderer stopped");
    await t?.terminate();
  }

  private start(): Worker {
    if (this.thread) return this.thread;
    const t = new Worker(this.url, { execArgv: [] });
    t.on("message", (msg: FromRenderThread) => {
      const p = this.pending.get(msg.id);
      this.pending.delete(msg.id);
      if (!p) return;
      if ("data" in msg) p.resolve(Buffer.from(msg.data.buffer, msg.data.byteOffset, msg.data.byteLength));
      else p.reject(new Error(`the report file could not be rendered: ${msg.error}`));
    });
    t.on("error", (e) => this.log?.("report renderer thread error", e));
    t.on("exit", () => {
      if (this.thread !== t) return;
      this.thread = null;
      if (this.stopped) return;
      this.log?.("the report renderer thread stopped; the next file starts a new one");
      this.failAll("the report renderer thread stopped; try again");
    });
    this.thread = t;
    return t;
  }

  private failAll(message: string) {
    for (const p of this.pending.values()) p.reject(new Error(message));
    this.pending.clear();
  }
}
