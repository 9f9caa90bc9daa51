import { statfs } from "node:fs/promises";
import { tmpdir } from "node:os";
import { DISK_FULL_MESSAGE, HttpError, isDiskFull } from "./errors";

/**
 * Room on disk, checked before the server writes anything large (an upload, a report's files).
 * PGlite stuck flushing its write-ahead log on a full disk kept the server busy for minutes, so
 * the check refuses the write with 507 while there is still room to answer; once space is freed,
 * the next write goes through without a restart.
 */
export type StorageGuard = {
  /** Throws a 507 `insufficient_storage` when fewer than `bytes` plus the reserve are free. */
  assertRoom: (bytes: number) => Promise<void>;
  /** Where uploads are streamed before they are read (a temporary folder). */
  uploadDir: string;
  /** Bytes one workspace may keep in uploads and report files. */
  workspaceQuotaBytes: number;
};

export type StorageSettings = {
  /** The folders whose file systems must have room: the data folder and the upload folder. */
  paths: string[];
  /** Free space always left alone, for the database's own log and the operating system. */
  reserveBytes: number;
  workspaceQuotaBytes: number;
  uploadDir?: string;
};

const MB = 1024 * 1024;

export const insufficientStorage = () => new HttpError(507, "insufficient_storage", DISK_FULL_MESSAGE);

/** Free bytes on the file system that holds `path` (for an unprivileged process). */
export async function freeBytes(path: string): Promise<number> {
  const s = await statfs(path);
  return Number(s.bavail) * Number(s.bsize);
}

export function storageGuard(settings: StorageSettings, free: (path: string) => Promise<number> = freeBytes): StorageGuard {
  return {
    uploadDir: settings.uploadDir ?? tmpdir(),
    workspaceQuotaBytes: settings.workspaceQuotaBytes,
    async assertRoom(bytes) {
      for (const path of settings.paths) {
        let room: number;
        try {
          room = await free(path);
        } catch (err) {
          if (isDiskFull(err)) throw insufficientStorage();
          throw err;
        }
        if (room < bytes + settings.reserveBytes) throw insufficientStorage();
      }
    },
  };
}

/** The defaults of `npm start`: 256 MB kept free, 2 GB per workspace (both set in the environment). */
export function storageSettingsOf(env: {
  DATA_DIR: string;
  DATABASE_URL?: string;
  MIN_FREE_DISK_MB: number;
  WORKSPACE_QUOTA_MB: number;
}): StorageSettings {
  return {
    // PGlite's folder must have room; a PostgreSQL server watches its own disk.
    paths: env.DATABASE_URL || env.DATA_DIR === "memory://" ? [tmpdir()] : [env.DATA_DIR, tmpdir()],
    reserveBytes: env.MIN_FREE_DISK_MB * MB,
    workspaceQuotaBytes: env.WORKSPACE_QUOTA_MB * MB,
  };
}
