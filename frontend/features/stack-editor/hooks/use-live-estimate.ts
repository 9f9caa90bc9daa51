/**
 * Runs the live estimate in a Web Worker ~400 ms after the last change. A newer change
 * makes a running estimate stale: that worker is terminated (the engine does not stop
 * mid-block) and a fresh one takes the new run. The previous figures stay on screen,
 * marked as updating, so the strip does not flash.
 */
import { useEffect, useRef, useState } from "react";
import type { StackFile } from "@shared/schemas/stack-file";
import type { Requirement, StudyFile } from "@shared/schemas/study-file";
import { liveStudy, type EstimateSummary } from "../lib/live-estimate";
import type { EstimateAnswer, EstimateRequest } from "../workers/live-estimate.worker";

export const ESTIMATE_DEBOUNCE_MS = 400;

export type EstimateStatus = "waiting" | "running" | "ready" | "paused" | "error" | "unavailable";

export interface EstimateState {
  status: EstimateStatus;
  summary: EstimateSummary | null;
  /** the figures belong to an earlier version of the document */
  stale: boolean;
  /** time the last run took in the worker (ms) */
  ms: number | null;
  error: string | null;
  /** the stack and study of the figures, so the 3D view can regenerate their worst trials */
  basis: { stack: StackFile; study: StudyFile } | null;
}

function spawn(): Worker {
  return new Worker(new URL("../workers/live-estimate.worker.ts", import.meta.url), { type: "module", name: "live-estimate" });
}

export function useLiveEstimate(stack: StackFile, requirements: Requirement[], valid: boolean): EstimateState {
  const [state, setState] = useState<EstimateState>(() => ({
    status: typeof Worker === "undefined" ? "unavailable" : valid ? "waiting" : "paused",
    summary: null,
    stale: false,
    ms: null,
    error: null,
    basis: null,
  }));
  const worker = useRef<Worker | null>(null);
  const busy = useRef(false);
  const runId = useRef(0);
  const first = useRef(true);

  useEffect(
    () => () => {
      worker.current?.terminate();
      worker.current = null;
    },
    [],
  );

  useEffect(() => {
    if (typeof Worker === "undefined") return;
    if (!valid) {
      // Nothing to run; a run in flight is for an older stack.
      runId.current++;
      setState((s) => ({ ...s, status: "paused", stale: s.summary !== null }));
      return;
    }
    setState((s) => ({ ...s, status: "waiting", stale: s.summary !== null }));
    const delay = first.current ? 0 : ESTIMATE_DEBOUNCE_MS;
    first.current = false;
    const timer = window.setTimeout(() => {
      const id = ++runId.current;
      if (busy.current && worker.current) {
        worker.current.terminate();
        worker.current = null;
      }
      const w = worker.current ?? (worker.current = spawn());
      busy.current = true;
      const basisStack = stack;
      w.onmessage = (event: MessageEvent<EstimateAnswer>) => {
        const answer = event.data;
        if (answer.runId !== runId.current) return;
        busy.current = false;
        if (answer.type === "result") {
          setState({
            status: "ready",
            summary: answer.summary,
            stale: false,
            ms: answer.ms,
            error: null,
            basis: { stack: basisStack, study: liveStudy(basisStack, requirements).study },
          });
        } else {
          setState((s) => ({ ...s, status: "error", error: answer.message, stale: s.summary !== null }));
        }
      };
      w.onerror = (event) => {
        event.preventDefault();
        busy.current = false;
        worker.current?.terminate();
        worker.current = null;
        setState((s) => ({ ...s, status: "error", error: "The estimate could not run in this browser.", stale: s.summary !== null }));
      };
      const request: EstimateRequest = { runId: id, stack, requirements };
      w.postMessage(request);
      setState((s) => ({ ...s, status: "running" }));
    }, delay);
    return () => window.clearTimeout(timer);
  }, [stack, requirements, valid]);

  return state;
}
