import * as z from "zod";

/** One worker process of the job queue (server mode), as last seen. */
export const QueueWorkerSchema = z.object({
  id: z.string(),
  host: z.string(),
  pid: z.number().int(),
  threads: z.number().int(),
  jobsDone: z.number().int(),
  startedAt: z.string(),
  seenAt: z.string(),
});

/**
 * What the admin's status page shows: where studies run and how busy that is. `queue` is null on
 * one machine (studies run in the server's own worker threads); with DATABASE_URL it is the job
 * queue's depth and the worker processes seen in the last minute.
 */
export const QueueStatusSchema = z.object({ depth: z.number().int(), active: z.number().int(), workers: z.array(QueueWorkerSchema) });
export type QueueStatus = z.infer<typeof QueueStatusSchema>;

export const ServerStatusSchema = z.object({
  startedAt: z.string(),
  studies: z.object({ queued: z.number().int(), running: z.number().int() }),
  engine: z.object({ threads: z.number().int(), activeStudies: z.number().int() }),
  queue: QueueStatusSchema.nullable(),
});

/** `GET /api/health` (no session): up, and in server mode the job queue (load balancers, the bench scripts). */
export const HealthSchema = z.object({ status: z.literal("ok"), queue: QueueStatusSchema.optional() });
export type ServerStatus = z.infer<typeof ServerStatusSchema>;
