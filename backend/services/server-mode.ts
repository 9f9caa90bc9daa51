import type { DatabaseHandle } from "../db/client";
import type { Env } from "../lib/env";
import { defaultThreads } from "../engine/runner";
import { ENGINE_NICE } from "../engine/pool";
import { JobStudyQueue, openJobQueue, queueStatus, StudyJobWorker, type JobQueueSettings, type QueueStatus } from "./study-jobs";
import { JobWhatIfQueue } from "./what-if-jobs";

export type ServerMode = {
  studyQueue: JobStudyQueue;
  /** Sweeps and allocations go through the job queue too. */
  whatIfQueue: JobWhatIfQueue;
  queueStatus: () => Promise<QueueStatus>;
  /** Present when this process also runs study jobs. */
  worker?: StudyJobWorker;
  stop: () => Promise<void>;
};

export function jobSettingsOf(
  env: Pick<Env, "STUDY_JOB_EXPIRE_SECONDS" | "WHAT_IF_JOB_EXPIRE_SECONDS" | "QUEUE_MAINTENANCE_SECONDS">,
): JobQueueSettings {
  return {
    expireSeconds: env.STUDY_JOB_EXPIRE_SECONDS,
    whatIfExpireSeconds: env.WHAT_IF_JOB_EXPIRE_SECONDS,
    maintenanceSeconds: env.QUEUE_MAINTENANCE_SECONDS,
    pollSeconds: 1,
  };
}

/**
 * With DATABASE_URL: studies and what-if runs go through the job queue. This process dispatches
 * queued ones, and runs jobs itself unless `runStudies` is false (then only `npm run worker`
 * processes do).
 */
export async function startServerMode(
  handle: DatabaseHandle,
  opts: { settings: JobQueueSettings; runStudies: boolean; threads?: number; log: (m: string, e?: unknown) => void },
): Promise<ServerMode> {
  if (handle.kind !== "postgres" || !handle.url) throw new Error("server mode needs a PostgreSQL server (DATABASE_URL)");
  const boss = await openJobQueue(handle.url, opts.settings, opts.log);
  const studyQueue = new JobStudyQueue(handle.db, boss, opts.log, opts.settings);
  const whatIfQueue = new JobWhatIfQueue(handle.db, boss, opts.log, opts.settings.whatIfExpireSeconds);
  const worker = opts.runStudies
    ? // niced as the warm pool's threads: this process answers requests too
      new StudyJobWorker(handle.db, boss, opts.log, {
        threads: opts.threads ?? defaultThreads(),
        settings: opts.settings,
        nice: ENGINE_NICE,
      })
    : undefined;
  await worker?.start();
  return {
    studyQueue,
    whatIfQueue,
    worker,
    queueStatus: () => queueStatus(handle.db, boss),
    stop: async () => {
      await studyQueue.stop();
      await whatIfQueue.stop();
      await worker?.stop();
      await boss.stop({ graceful: false, close: true, wait: true }).catch(() => undefined);
    },
  };
}
