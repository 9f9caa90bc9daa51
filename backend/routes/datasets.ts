import { Router, type RequestHandler } from "express";
import multer from "multer";
import { IdParamsSchema } from "@shared/schemas/common";
import {
  DATASET_MAX_BYTES,
  StatisticsQuerySchema,
  UpdateDatasetSchema,
  UpdateMappingsSchema,
  UploadFieldsSchema,
} from "@shared/schemas/datasets";
import type { AppDeps } from "../deps";
import { badRequest, HttpError } from "../lib/errors";
import { parse } from "../lib/validate";
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

const upload = multer({
  storage: multer.memoryStorage(),
  limits: { fileSize: DATASET_MAX_BYTES, files: 1, fields: 5, parts: 6 },
  defParamCharset: "utf8",
}).single("file");

/** Multer's refusals in our one error shape: an oversized file is a 413, the rest 400. */
const receiveFile: RequestHandler = (req, res, next) => {
  upload(req, res, (err: unknown) => {
    if (!err) return next();
    if (err instanceof multer.MulterError) {
      if (err.code === "LIMIT_FILE_SIZE") {
        return next(
          new HttpError(
            413,
            "too_large",
            `The file is larger than ${DATASET_MAX_BYTES / 1048576} MB, the most one upload may be. Nothing was stored.`,
          ),
        );
      }
      if (err.code === "LIMIT_UNEXPECTED_FILE" || err.code === "LIMIT_FILE_COUNT") {
        return next(
          badRequest(
            "Send one file, in the form field “file”.",
            [{ path: "file", message: "one CSV or XLSX file in the field “file”" }],
            "missing_file",
          ),
        );
      }
      return next(badRequest("The upload could not be read as a form with one file.", undefined, "bad_upload"));
    }
    next(err);
  });
};

/** The routes that take a multipart file upload (every other route reads JSON only). */
export const UPLOAD_PATHS = ["/projects/:id/datasets", "/reports/:id/datasets"] as const;

export function datasetsRouter(deps: AppDeps) {
  const { db } = deps;
  const r = Router();

  r.get("/projects/:id/datasets", allow("projects.read"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    res.json({ datasets: await listDatasets(db, actorOf(req).workspaceId, id) });
  });

  // The role is checked before the body is read, so a refused caller never uploads anything.
  r.post(UPLOAD_PATHS[0], allow("datasets.write"), receiveFile, async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const fields = parse(UploadFieldsSchema, req);
    res.status(201).json(await uploadDataset(db, actorOf(req), id, req.file, fields));
  });

  r.get("/datasets/:id", allow("projects.read"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    res.json(await getDataset(db, actorOf(req).workspaceId, id));
  });

  r.delete("/datasets/:id", allow("datasets.write"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    await deleteDataset(db, actorOf(req), id);
    res.status(204).end();
  });

  r.patch("/datasets/:id", allow("datasets.write"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const input = parse(UpdateDatasetSchema, req);
    res.json(await updateDataset(db, actorOf(req), id, input));
  });

  r.patch("/datasets/:id/mappings", allow("datasets.write"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const input = parse(UpdateMappingsSchema, req);
    res.json(await updateMappings(db, actorOf(req), id, input));
  });

  r.get("/datasets/:id/statistics", allow("projects.read"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const { column } = parse(StatisticsQuerySchema, req, "query");
    res.json(await datasetStatistics(db, actorOf(req).workspaceId, id, column));
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
    res.json({ datasets: await listReportDatasets(db, actorOf(req), id) });
  });

  r.post(UPLOAD_PATHS[1], allow("datasets.send"), receiveFile, async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const fields = parse(UploadFieldsSchema, req);
    const dataset = await uploadForReport(db, actorOf(req), id, req.file, fields);
    if (actorOf(req).role === "supplier") await notifyReport(deps, actorOf(req), id, "measurements");
    res.status(201).json(dataset);
  });

  return r;
}
