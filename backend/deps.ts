import type { Auth } from "./auth";
import type { Database } from "./db/client";
import type { StudyQueue } from "./services/study-queue";

/** What the app is built from; tests build it with an in-memory database. */
export type AppDeps = {
  db: Database;
  auth: Auth;
  /** Public address used in links (invitations, report e-mails). */
  baseURL: string;
  log: (message: string, err?: unknown) => void;
  studyQueue: StudyQueue;
};
