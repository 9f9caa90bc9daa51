import type { QueueStatus } from "./services/study-jobs";
import type { Auth } from "./auth";
import type { Database } from "./db/client";
import type { MailService } from "./services/mail";
import type { EnginePool } from "./engine/pool";
import type { ReportRenderer } from "./services/report-renderer";
import type { StudyScheduler } from "./services/study-queue";
import type { WhatIfScheduler } from "./services/what-if-queue";

/** Writes a line of the server's log; an error goes with the message it explains. */
export type Log = (message: string, err?: unknown) => void;
/** The current time; tests may pass a fixed or moving one. */
export type Clock = () => Date;

/**
 * What the app is built from. `server.ts` makes it from the parsed environment
 * (`backend/runtime.ts`); tests build their own with an in-memory database. Nothing the
 * routes or services use comes from a module-global registry.
 */
import type { StorageGuard } from "./lib/storage";

export type AppDeps = {
  db: Database;
  auth: Auth;
  /** Public address used in links (invitations, report e-mails). */
  baseURL: string;
  log: Log;
  clock: Clock;
  /** Outgoing mail (SMTP or the local catcher); null when the server runs without mail. */
  mail: MailService | null;
  /** Runs studies: the in-process queue, or the job queue of server mode (DATABASE_URL). */
  studyQueue: StudyScheduler;
  /** Server mode only: the job queue's depth and the worker processes seen recently (health, status page). */
  queueStatus?: () => Promise<QueueStatus>;
  /** The warm engine worker threads, created at start and stopped at shutdown; the queue runs on it. */
  enginePool: EnginePool;
  /** Renders report files (PDF, spreadsheet, CSV) on a thread of its own; stopped at shutdown. */
  reportRenderer: ReportRenderer;
  /** Sweeps and allocations (issue 12): the in-process queue on the same pool, or the job queue of server mode. */
  whatIfQueue: WhatIfScheduler;
  /** Room on disk and the workspace quota, checked before large writes (507 when short). */
  storage: StorageGuard;
  /** Measurement uploads one supplier company may send per hour. */
  supplierUploadsPerHour: number;
  /**
   * Every JSON answer is parsed with its response schema before it leaves (development and
   * tests; NODE_ENV=production leaves it off): backend/lib/respond.ts.
   */
  checkResponses: boolean;
};

export const systemClock: Clock = () => new Date();
