import { Router, type RequestHandler } from "express";
import { readFile, rm } from "node:fs/promises";
import { rateLimit } from "express-rate-limit";
import multer from "multer";
import { IdParamsSchema } from "@shared/schemas/common";
import {
  DATASET_MAX_BYTES,
  DatasetListSchema,
  DatasetSchema,
  DatasetStatisticsSchema,
  StatisticsQuerySchema,
  UpdateDatasetSchema,
  UpdateMappingsSchema,
  UploadFieldsSchema,
} from "@shared/schemas/datasets";
import type { AppDeps } from "../deps";
import type { StorageGuard } from "../lib/storage";
import { assertQuota } from "../services/storage-usage";
import { badRequest, HttpError } from "../lib/errors";
import { send } from "../lib/respond";
import { parse } from "../lib/validate";
import { sendVersioned, sentVersion } from "../lib/versions";
import { actorOf, allow } from "../middleware/session";
import { notifyReport } from "../services/review-notifications";
import {
  datasetFile,
  deleteDataset,
  getDataset,
  listDatasets,
  listReportDatasets,
  updateDataset,
  uploadDataset,
  uploadForReport,
} from "../services/datasets";
import { datasetStatistics } from "../services/dataset-statistics";
import { updateMappings } from "../services/dataset-mappings";

/**
 * Receives the one file of an upload: the disk must have room first (507 when short), the body
 * is streamed to a temporary file (never held whole in memory while it arrives), then read and
 * the temporary file removed. Multer's refusals leave in our one error shape: an oversized file is
 * a 413, the rest 400; a disk that fills while writing is a 507 (errorHandler).
 */
function receiveFile(storage: StorageGuard): RequestHandler {
  const upload = multer({
    storage: multer.diskStorage({ destination: storage.uploadDir }),
    limits: { fileSize: DATASET_MAX_BYTES, files: 1, fields: 5, parts: 6 },
    defParamCharset: "utf8",
  }).single("file");
  return async (req, res, next) => {
    const announced = Number(req.headers["content-length"]);
    await storage.assertRoom(Number.isFinite(announced) && announced > 0 ? Math.min(announced, 2 * DATASET_MAX_BYTES) : DATASET_MAX_BYTES);
    upload(req, res, (err: unknown) => {
      const file = req.file;
      // The temporary file goes before the request moves on: the bytes are in memory by then.
      const done = (e?: unknown) => {
        if (!file?.path) return next(e);
        rm(file.path, { force: true }).then(
          () => next(e),
          () => next(e),
        );
      };
      if (err) return done(multerError(err));
      if (!file?.path) return next();
      readFile(file.path).then(
        (buffer) => {
          file.buffer = buffer;
          done();
        },
        (e: unknown) => done(e),
      );
    });
  };
}

function multerError(err: unknown): unknown {
  if (!(err instanceof multer.MulterError)) return err;
  if (err.code === "LIMIT_FILE_SIZE") {
    return new HttpError(
      413,
      "too_large",
      `The file is larger than ${DATASET_MAX_BYTES / 1048576} MB, the most one upload may be. Nothing was stored.`,
    );
  }
  if (err.code === "LIMIT_UNEXPECTED_FILE" || err.code === "LIMIT_FILE_COUNT") {
    return badRequest(
      "Send one file, in the form field “file”.",
      [{ path: "file", message: "one CSV or XLSX file in the field “file”" }],
      "missing_file",
    );
  }
  return badRequest("The upload could not be read as a form with one file.", undefined, "bad_upload");
}

/** A supplier company may send so many measurement uploads per hour (staff uploads are not limited here). */
function supplierUploadLimit(perHour: number): RequestHandler {
  return rateLimit({
    windowMs: 3_600_000,
    limit: perHour,
    standardHeaders: "draft-8",
    legacyHeaders: false,
    skip: (req) => req.actor?.role !== "supplier",
    keyGenerator: (req) => `supplier:${req.actor?.supplierId ?? "none"}`,
    handler: (_req, _res, next) =>
      next(
        new HttpError(
          429,
          "rate_limited",
          `Your company has sent ${perHour} measurement files in the last hour, the most allowed. Try again later.`,
        ),
      ),
  });
}

/** The routes that take a multipart file upload (every other route reads JSON only). */
export const UPLOAD_PATHS = ["/projects/:id/datasets", "/reports/:id/datasets"] as const;

export function datasetsRouter(deps: AppDeps) {
  const { db, storage } = deps;
  const r = Router();
  const receive = receiveFile(storage);
  const quota = (workspaceId: string, file: Express.Multer.File | undefined) =>
    assertQuota(db, workspaceId, file?.size ?? 0, storage.workspaceQuotaBytes);

  r.get("/projects/:id/datasets", allow("projects.read"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    send(res, DatasetListSchema, { datasets: await listDatasets(db, actorOf(req).workspaceId, id) });
  });

  // The role is checked before the body is read, so a refused caller never uploads anything.
  r.post(UPLOAD_PATHS[0], allow("datasets.write"), receive, async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const fields = parse(UploadFieldsSchema, req);
    await quota(actorOf(req).workspaceId, req.file);
    sendVersioned(res, DatasetSchema, await uploadDataset(db, actorOf(req), id, req.file, fields), 201);
  });

  r.get("/datasets/:id", allow("projects.read"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    sendVersioned(res, DatasetSchema, await getDataset(db, actorOf(req).workspaceId, id));
  });

  r.delete("/datasets/:id", allow("datasets.write"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    await deleteDataset(db, actorOf(req), id, sentVersion(req));
    res.status(204).end();
  });

  r.patch("/datasets/:id", allow("datasets.write"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const input = parse(UpdateDatasetSchema, req);
    sendVersioned(res, DatasetSchema, await updateDataset(db, actorOf(req), id, input, sentVersion(req)));
  });

  r.patch("/datasets/:id/mappings", allow("datasets.write"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const input = parse(UpdateMappingsSchema, req);
    sendVersioned(res, DatasetSchema, await updateMappings(db, actorOf(req), id, input, sentVersion(req)));
  });

  r.get("/datasets/:id/statistics", allow("projects.read"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const { column } = parse(StatisticsQuerySchema, req, "query");
    send(res, DatasetStatisticsSchema, await datasetStatistics(db, actorOf(req).workspaceId, id, column));
  });

  r.get("/datasets/:id/file", allow("projects.read"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const f = await datasetFile(db, actorOf(req).workspaceId, id);
    res.setHeader("Content-Type", f.contentType);
    res.setHeader("Content-Disposition", `attachment; filename*=UTF-8''${encodeURIComponent(f.name)}`);
    res.setHeader("X-Content-Type-Options", "nosniff");
    res.send(f.data);
  });

  r.get("/reports/:id/datasets", allow("reports.read"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    send(res, DatasetListSchema, { datasets: await listReportDatasets(db, actorOf(req), id) });
  });

  r.post(UPLOAD_PATHS[1], allow("datasets.send"), supplierUploadLimit(deps.supplierUploadsPerHour), receive, async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const fields = parse(UploadFieldsSchema, req);
    await quota(actorOf(req).workspaceId, req.file);
    const dataset = await uploadForReport(db, actorOf(req), id, req.file, fields);
    if (actorOf(req).role === "supplier") await notifyReport(deps, actorOf(req), id, "measurements");
    send(res, DatasetSchema, dataset, 201);
  });

  return r;
}
