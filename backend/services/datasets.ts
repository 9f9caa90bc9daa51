import { createHash } from "node:crypto";
import { and, desc, eq, inArray } from "drizzle-orm";
import type { Dataset, DatasetColumn, DatasetSummary, UpdateDataset, UploadFields } from "@shared/schemas/datasets";
import { stackSources, type StackSource } from "@shared/datasets/sources";
import { unitKind, type MeasureUnit } from "@shared/datasets/units";
import { formatCount } from "@shared/format";
import type { StackFile } from "@shared/schemas/stack-file";
import type { Database } from "../db/client";
import { datasetMappings, datasets, projects, reports, stackRevisions, suppliers, users } from "../db/schema";
import { badRequest, conflict, found } from "../lib/errors";
import { deleteVersioned, requireVersion, writeVersioned } from "../lib/versions";
import type { Actor } from "../middleware/session";
import { recordActivity } from "./activity";
import { assertProjectOpen } from "./project-records";
import { readMeasurementFile } from "./dataset-files";
import { pooledRows } from "./dataset-values";

export type UploadedFile = { originalname: string; buffer: Buffer };

const summaryColumns = {
  id: datasets.id,
  projectId: datasets.projectId,
  name: datasets.name,
  fileType: datasets.fileType,
  sheet: datasets.sheet,
  sizeBytes: datasets.sizeBytes,
  rows: datasets.rowCount,
  columns: datasets.columns,
  uploadedByName: users.name,
  uploadedByRole: datasets.uploaderRole,
  supplierName: suppliers.name,
  reportId: reports.id,
  reportNumber: reports.number,
  reportRevision: reports.revision,
  lot: datasets.lot,
  note: datasets.note,
  lotColumn: datasets.lotColumn,
  createdAt: datasets.createdAt,
  version: datasets.version,
};

function baseQuery(db: Database) {
  return db
    .select(summaryColumns)
    .from(datasets)
    .leftJoin(users, eq(users.id, datasets.uploadedBy))
    .leftJoin(suppliers, eq(suppliers.id, datasets.supplierId))
    .leftJoin(reports, eq(reports.id, datasets.reportId));
}

type SummaryRow = Awaited<ReturnType<ReturnType<typeof baseQuery>["where"]>>[number];
type MappingRow = {
  datasetId: string;
  column: string;
  revisionId: string;
  revisionNumber: number;
  source: string;
  part: number | null;
  unit: string;
  nominal: number;
  updatedByName: string | null;
  updatedAt: Date;
};

async function mappingsOf(db: Database, ids: string[]): Promise<MappingRow[]> {
  if (!ids.length) return [];
  return db
    .select({
      datasetId: datasetMappings.datasetId,
      column: datasetMappings.column,
      revisionId: datasetMappings.revisionId,
      revisionNumber: stackRevisions.number,
      source: datasetMappings.source,
      part: datasetMappings.part,
      unit: datasetMappings.unit,
      nominal: datasetMappings.nominal,
      updatedByName: users.name,
      updatedAt: datasetMappings.updatedAt,
    })
    .from(datasetMappings)
    .innerJoin(stackRevisions, eq(stackRevisions.id, datasetMappings.revisionId))
    .leftJoin(users, eq(users.id, datasetMappings.updatedBy))
    .where(inArray(datasetMappings.datasetId, ids));
}

function toSummary(r: SummaryRow, maps: MappingRow[]): DatasetSummary {
  const cols = r.columns;
  return {
    id: r.id,
    projectId: r.projectId,
    name: r.name,
    fileType: r.fileType,
    sheet: r.sheet,
    sizeBytes: r.sizeBytes,
    rows: r.rows,
    columnCount: cols.length,
    mappedColumns: maps.filter((m) => m.datasetId === r.id).map((m) => ({ column: m.column, source: m.source })),
    uploadedByName: r.uploadedByName,
    uploadedByRole: r.uploadedByRole,
    supplierName: r.supplierName,
    report: r.reportId ? { id: r.reportId, number: r.reportNumber!, revision: r.reportRevision! } : null,
    lot: r.lot,
    note: r.note,
    lotColumn: r.lotColumn,
    createdAt: r.createdAt.toISOString(),
    version: r.version,
  };
}

async function assertProject(db: Database, workspaceId: string, projectId: string) {
  const [p] = await db
    .select({ id: projects.id })
    .from(projects)
    .where(and(eq(projects.workspaceId, workspaceId), eq(projects.id, projectId)));
  return found(p, "The project");
}

export async function listDatasets(db: Database, workspaceId: string, projectId: string): Promise<DatasetSummary[]> {
  await assertProject(db, workspaceId, projectId);
  const rows = await baseQuery(db)
    .where(and(eq(datasets.workspaceId, workspaceId), eq(datasets.projectId, projectId)))
    .orderBy(desc(datasets.createdAt));
  const maps = await mappingsOf(
    db,
    rows.map((r) => r.id),
  );
  return rows.map((r) => toSummary(r, maps));
}

export async function getDataset(db: Database, workspaceId: string, id: string): Promise<Dataset> {
  const [row] = await baseQuery(db).where(and(eq(datasets.workspaceId, workspaceId), eq(datasets.id, id)));
  const r = found(row, "The data set");
  const [extra] = await db.select({ preview: datasets.preview, sha256: datasets.sha256 }).from(datasets).where(eq(datasets.id, id));
  const maps = await mappingsOf(db, [id]);
  const stacks = new Map<string, StackSource[]>();
  for (const revId of new Set(maps.map((m) => m.revisionId))) {
    const [rv] = await db.select({ stack: stackRevisions.stack }).from(stackRevisions).where(eq(stackRevisions.id, revId));
    stacks.set(revId, rv ? stackSources(rv.stack as StackFile) : []);
  }
  const sourceOf = (m: MappingRow) => stacks.get(m.revisionId)?.find((x) => x.id === m.source) ?? null;
  const columns: DatasetColumn[] = r.columns.map((c) => {
    const m = maps.find((x) => x.column === c.key);
    return {
      ...c,
      summary: c.summary ? { ...c.summary, missing: c.summary.missing ?? 0 } : null,
      mapping: m
        ? {
            revisionId: m.revisionId,
            revisionNumber: m.revisionNumber,
            source: m.source,
            part: m.part,
            partLabel: m.part !== null ? (sourceOf(m)?.parts?.[m.part]?.label ?? null) : null,
            unit: m.unit as MeasureUnit,
            sourceUnit: unitKind(m.unit as MeasureUnit),
            nominal: m.nominal,
            updatedByName: m.updatedByName,
            updatedAt: m.updatedAt.toISOString(),
          }
        : null,
    };
  });
  return { ...toSummary(r, maps), columns, pooled: await pooledOf(db, id, maps, sourceOf), preview: extra.preview, sha256: extra.sha256 };
}

/** Each pooled source of the data set: its columns, and how many rows are complete. */
async function pooledOf(
  db: Database,
  id: string,
  maps: MappingRow[],
  sourceOf: (m: MappingRow) => StackSource | null,
): Promise<Dataset["pooled"]> {
  const groups = new Map<string, MappingRow[]>();
  for (const m of maps) {
    if (m.part === null) continue;
    const k = `${m.revisionId} ${m.source}`;
    groups.set(k, [...(groups.get(k) ?? []), m]);
  }
  if (!groups.size) return [];
  const [row] = await db.select({ data: datasets.data }).from(datasets).where(eq(datasets.id, id));
  return [...groups.values()].map((g) => {
    const src = sourceOf(g[0]);
    const parts = src?.parts?.length ?? g.length;
    const cols = g.map((m) => ({ column: m.column, part: m.part!, unit: m.unit as MeasureUnit, nominal: m.nominal }));
    const p = pooledRows(row.data, cols, src?.unit ?? unitKind(cols[0].unit));
    const have = new Set(g.map((m) => m.part));
    return {
      source: g[0].source,
      revisionNumber: g[0].revisionNumber,
      columns: [...g].sort((a, b) => a.part! - b.part!).map((m) => m.column),
      missingParts: (src?.parts ?? []).filter((x) => !have.has(x.index)).map((x) => x.label),
      parts,
      completeRows: p.rows.length,
      dropped: p.dropped,
    };
  });
}

type Origin = { supplierId: string | null; reportId: string | null; via?: string };

/** Reads the file completely first; only a file without a single problem is stored (one transaction, with its activity). */
async function storeUpload(
  db: Database,
  actor: Actor,
  projectId: string,
  file: UploadedFile | undefined,
  origin: Origin,
  fields: UploadFields = {},
): Promise<Dataset> {
  if (!file)
    throw badRequest(
      "Attach the measurement file in the form field “file” (multipart/form-data).",
      [{ path: "file", message: "a CSV or XLSX file is required" }],
      "missing_file",
    );
  const name = (file.originalname || "measurements").replace(/[\\/]/g, "_").slice(0, 200);
  const parsed = await readMeasurementFile(name, file.buffer);
  const sha256 = createHash("sha256").update(file.buffer).digest("hex");
  const id = await db.transaction(async (tx) => {
    const [row] = await tx
      .insert(datasets)
      .values({
        workspaceId: actor.workspaceId,
        projectId,
        name,
        fileType: parsed.fileType,
        sheet: parsed.sheet,
        sizeBytes: file.buffer.length,
        sha256,
        rowCount: parsed.rowNumbers.length,
        columns: parsed.columns,
        data: parsed.data,
        preview: parsed.preview,
        rowNumbers: parsed.rowNumbers,
        file: file.buffer,
        uploadedBy: actor.userId,
        uploaderRole: actor.role,
        supplierId: origin.supplierId,
        reportId: origin.reportId,
        lot: fields.lot || null,
        note: fields.note || null,
      })
      .returning({ id: datasets.id });
    const numeric = parsed.columns.filter((c) => c.kind === "number").length;
    await recordActivity(tx, {
      workspaceId: actor.workspaceId,
      projectId,
      actorId: actor.userId,
      action: "dataset.uploaded",
      summary: `${origin.via ? "sent" : "uploaded"} the data set “${name}” (${formatCount(parsed.rowNumbers.length)} rows, ${numeric} measured ${numeric === 1 ? "column" : "columns"}${fields.lot ? `, lot ${fields.lot}` : ""})${origin.via ?? ""}`,
      data: { datasetId: row.id, ...(origin.reportId ? { reportId: origin.reportId } : {}) },
    });
    return row.id;
  });
  return getDataset(db, actor.workspaceId, id);
}

export async function uploadDataset(
  db: Database,
  actor: Actor,
  projectId: string,
  file: UploadedFile | undefined,
  fields: UploadFields = {},
) {
  await assertProject(db, actor.workspaceId, projectId);
  await assertProjectOpen(db, actor.workspaceId, projectId);
  return storeUpload(db, actor, projectId, file, { supplierId: actor.supplierId, reportId: null }, fields);
}

/**
 * The report a caller may see: staff any report of the workspace, a supplier only a released
 * report of its own company (anything else is "not found", so report ids do not leak).
 */
async function visibleReport(db: Database, actor: Actor, reportId: string) {
  const [r] = await db
    .select()
    .from(reports)
    .where(and(eq(reports.workspaceId, actor.workspaceId), eq(reports.id, reportId)));
  const report = found(r, "The report");
  if (actor.role === "supplier" && (report.supplierId === null || report.supplierId !== actor.supplierId || report.status !== "released")) {
    throw found(null, "The report");
  }
  return report;
}

/** A supplier (or an engineer on its behalf) sends the measurements a released report asks for. */
export async function uploadForReport(
  db: Database,
  actor: Actor,
  reportId: string,
  file: UploadedFile | undefined,
  fields: UploadFields = {},
) {
  const report = await visibleReport(db, actor, reportId);
  if (report.status !== "released")
    throw conflict(
      `Report TR-${String(report.number).padStart(4, "0")} is not released yet; measurements are sent against a released report.`,
      "invalid_state",
    );
  const [s] = report.supplierId ? await db.select({ name: suppliers.name }).from(suppliers).where(eq(suppliers.id, report.supplierId)) : [];
  const tr = `TR-${String(report.number).padStart(4, "0")} rev ${report.revision}`;
  return storeUpload(
    db,
    actor,
    report.projectId,
    file,
    {
      supplierId: report.supplierId,
      reportId: report.id,
      via: ` for report ${tr}${s ? ` (${s.name})` : ""}`,
    },
    fields,
  );
}

export async function listReportDatasets(db: Database, actor: Actor, reportId: string): Promise<DatasetSummary[]> {
  const report = await visibleReport(db, actor, reportId);
  const rows = await baseQuery(db)
    .where(and(eq(datasets.workspaceId, actor.workspaceId), eq(datasets.reportId, report.id)))
    .orderBy(desc(datasets.createdAt));
  const maps = await mappingsOf(
    db,
    rows.map((r) => r.id),
  );
  return rows.map((r) => toSummary(r, maps));
}

export async function datasetRow(db: Database, workspaceId: string, id: string) {
  const [row] = await db
    .select()
    .from(datasets)
    .where(and(eq(datasets.workspaceId, workspaceId), eq(datasets.id, id)));
  return found(row, "The data set");
}

/** Marks (or clears) the label column that names each row's lot or date. */
export async function updateDataset(
  db: Database,
  actor: Actor,
  id: string,
  input: UpdateDataset,
  sent: number | undefined,
): Promise<Dataset> {
  const ds = await datasetRow(db, actor.workspaceId, id);
  await assertProjectOpen(db, actor.workspaceId, ds.projectId);
  const expected = requireVersion(`The data set “${ds.name}”`, ds.version, sent);
  const columns = ds.columns;
  if (input.lotColumn !== null) {
    const c = columns.find((x) => x.key === input.lotColumn);
    if (!c)
      throw badRequest(
        `The data set has no column “${input.lotColumn}”.`,
        [{ path: "lotColumn", message: `no column “${input.lotColumn}” in this data set` }],
        "unknown_column",
      );
    if (c.kind !== "label")
      throw badRequest(
        `Column “${input.lotColumn}” holds measurements, not lots.`,
        [{ path: "lotColumn", message: "the lot column must hold labels (lot numbers or dates)" }],
        "not_label",
      );
  }
  await db.transaction(async (tx) => {
    await writeVersioned(tx, datasets, id, expected, `The data set “${ds.name}”`, { lotColumn: input.lotColumn });
    await recordActivity(tx, {
      workspaceId: actor.workspaceId,
      projectId: ds.projectId,
      actorId: actor.userId,
      action: "dataset.lots",
      summary: input.lotColumn
        ? `marked “${input.lotColumn}” as the lot column of the data set “${ds.name}”`
        : `cleared the lot column of the data set “${ds.name}”`,
      data: { datasetId: id },
    });
  });
  return getDataset(db, actor.workspaceId, id);
}

/** Deletes a data set on the version the caller last read (`sent`: none is a 428, a stale one a 409). */
export async function deleteDataset(db: Database, actor: Actor, id: string, sent: number | undefined) {
  const ds = await datasetRow(db, actor.workspaceId, id);
  await assertProjectOpen(db, actor.workspaceId, ds.projectId);
  const what = `The data set “${ds.name}”`;
  const expected = requireVersion(what, ds.version, sent);
  await db.transaction(async (tx) => {
    await deleteVersioned(tx, datasets, id, expected, what);
    await recordActivity(tx, {
      workspaceId: actor.workspaceId,
      projectId: ds.projectId,
      actorId: actor.userId,
      action: "dataset.deleted",
      summary: `deleted the data set “${ds.name}”`,
    });
  });
}

export async function datasetFile(db: Database, workspaceId: string, id: string) {
  const ds = await datasetRow(db, workspaceId, id);
  return {
    name: ds.name,
    contentType: ds.fileType === "xlsx" ? "application/vnd.openxmlformats-officedocument.spreadsheetml.sheet" : "text/csv",
    data: ds.file,
  };
}
