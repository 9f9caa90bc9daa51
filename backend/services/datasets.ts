import { createHash } from "node:crypto";
import { and, desc, eq, inArray } from "drizzle-orm";
import type { Dataset, DatasetColumn, DatasetStatistics, DatasetSummary, UpdateMappings } from "@shared/schemas/datasets";
import { findSource, toleranceLimits } from "@shared/datasets/sources";
import { andersonDarling, AD_MIN_N, capability, histogram, outliers, OUTLIER_LIMIT, summarize } from "@shared/datasets/statistics";
import { conversionFactor, unitKind, type MeasureUnit, type SourceUnit } from "@shared/datasets/units";
import { formatCount, unitText } from "@shared/format";
import type { StackFile } from "@shared/schemas/stack-file";
import type { Database } from "../db/client";
import { datasetMappings, datasets, projects, reports, stackRevisions, suppliers, users } from "../db/schema";
import { badRequest, conflict, found } from "../lib/errors";
import type { Actor } from "../middleware/session";
import { recordActivity } from "./activity";
import { assertProjectOpen } from "./project-records";
import { readMeasurementFile, type ParsedColumn } from "./dataset-files";

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
  createdAt: datasets.createdAt,
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
type MappingRow = { datasetId: string; column: string; revisionId: string; revisionNumber: number; source: string; unit: string; nominal: number; updatedByName: string | null; updatedAt: Date };

async function mappingsOf(db: Database, ids: string[]): Promise<MappingRow[]> {
  if (!ids.length) return [];
  return db
    .select({
      datasetId: datasetMappings.datasetId,
      column: datasetMappings.column,
      revisionId: datasetMappings.revisionId,
      revisionNumber: stackRevisions.number,
      source: datasetMappings.source,
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
  const cols = r.columns as unknown as ParsedColumn[];
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
    createdAt: r.createdAt.toISOString(),
  };
}

async function assertProject(db: Database, workspaceId: string, projectId: string) {
  const [p] = await db.select({ id: projects.id }).from(projects).where(and(eq(projects.workspaceId, workspaceId), eq(projects.id, projectId)));
  return found(p, "The project");
}

export async function listDatasets(db: Database, workspaceId: string, projectId: string): Promise<DatasetSummary[]> {
  await assertProject(db, workspaceId, projectId);
  const rows = await baseQuery(db)
    .where(and(eq(datasets.workspaceId, workspaceId), eq(datasets.projectId, projectId)))
    .orderBy(desc(datasets.createdAt));
  const maps = await mappingsOf(db, rows.map((r) => r.id));
  return rows.map((r) => toSummary(r, maps));
}

export async function getDataset(db: Database, workspaceId: string, id: string): Promise<Dataset> {
  const [row] = await baseQuery(db).where(and(eq(datasets.workspaceId, workspaceId), eq(datasets.id, id)));
  const r = found(row, "The data set");
  const [extra] = await db.select({ preview: datasets.preview, sha256: datasets.sha256 }).from(datasets).where(eq(datasets.id, id));
  const maps = await mappingsOf(db, [id]);
  const columns: DatasetColumn[] = (r.columns as unknown as ParsedColumn[]).map((c) => {
    const m = maps.find((x) => x.column === c.key);
    return {
      ...c,
      mapping: m
        ? {
            revisionId: m.revisionId,
            revisionNumber: m.revisionNumber,
            source: m.source,
            unit: m.unit as MeasureUnit,
            sourceUnit: unitKind(m.unit as MeasureUnit),
            nominal: m.nominal,
            updatedByName: m.updatedByName,
            updatedAt: m.updatedAt.toISOString(),
          }
        : null,
    };
  });
  return { ...toSummary(r, maps), columns, preview: extra.preview, sha256: extra.sha256 };
}

type Origin = { supplierId: string | null; reportId: string | null; via?: string };

/** Reads the file completely first; only a file without a single problem is stored (one transaction, with its activity). */
async function storeUpload(db: Database, actor: Actor, projectId: string, file: UploadedFile | undefined, origin: Origin): Promise<Dataset> {
  if (!file) throw badRequest("Attach the measurement file in the form field “file” (multipart/form-data).", [{ path: "file", message: "a CSV or XLSX file is required" }], "missing_file");
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
        columns: parsed.columns as unknown as Array<Record<string, unknown>>,
        data: parsed.data,
        preview: parsed.preview,
        rowNumbers: parsed.rowNumbers,
        file: file.buffer,
        uploadedBy: actor.userId,
        uploaderRole: actor.role,
        supplierId: origin.supplierId,
        reportId: origin.reportId,
      })
      .returning({ id: datasets.id });
    const numeric = parsed.columns.filter((c) => c.kind === "number").length;
    await recordActivity(tx, {
      workspaceId: actor.workspaceId,
      projectId,
      actorId: actor.userId,
      action: "dataset.uploaded",
      summary: `${origin.via ? "sent" : "uploaded"} the data set “${name}” (${formatCount(parsed.rowNumbers.length)} rows, ${numeric} measured ${numeric === 1 ? "column" : "columns"})${origin.via ?? ""}`,
      data: { datasetId: row.id, ...(origin.reportId ? { reportId: origin.reportId } : {}) },
    });
    return row.id;
  });
  return getDataset(db, actor.workspaceId, id);
}

export async function uploadDataset(db: Database, actor: Actor, projectId: string, file: UploadedFile | undefined) {
  await assertProject(db, actor.workspaceId, projectId);
  await assertProjectOpen(db, actor.workspaceId, projectId);
  return storeUpload(db, actor, projectId, file, { supplierId: actor.supplierId, reportId: null });
}

/**
 * The report a caller may see: staff any report of the workspace, a supplier only a released
 * report of its own company (anything else is "not found", so report ids do not leak).
 */
async function visibleReport(db: Database, actor: Actor, reportId: string) {
  const [r] = await db.select().from(reports).where(and(eq(reports.workspaceId, actor.workspaceId), eq(reports.id, reportId)));
  const report = found(r, "The report");
  if (actor.role === "supplier" && (report.supplierId === null || report.supplierId !== actor.supplierId || report.status !== "released")) {
    throw found(null, "The report");
  }
  return report;
}

/** A supplier (or an engineer on its behalf) sends the measurements a released report asks for. */
export async function uploadForReport(db: Database, actor: Actor, reportId: string, file: UploadedFile | undefined) {
  const report = await visibleReport(db, actor, reportId);
  if (report.status !== "released") throw conflict(`Report TR-${String(report.number).padStart(4, "0")} is not released yet; measurements are sent against a released report.`, "invalid_state");
  const [s] = report.supplierId ? await db.select({ name: suppliers.name }).from(suppliers).where(eq(suppliers.id, report.supplierId)) : [];
  const tr = `TR-${String(report.number).padStart(4, "0")} rev ${report.revision}`;
  return storeUpload(db, actor, report.projectId, file, {
    supplierId: report.supplierId,
    reportId: report.id,
    via: ` for report ${tr}${s ? ` (${s.name})` : ""}`,
  });
}

export async function listReportDatasets(db: Database, actor: Actor, reportId: string): Promise<DatasetSummary[]> {
  const report = await visibleReport(db, actor, reportId);
  const rows = await baseQuery(db)
    .where(and(eq(datasets.workspaceId, actor.workspaceId), eq(datasets.reportId, report.id)))
    .orderBy(desc(datasets.createdAt));
  const maps = await mappingsOf(db, rows.map((r) => r.id));
  return rows.map((r) => toSummary(r, maps));
}

async function datasetRow(db: Database, workspaceId: string, id: string) {
  const [row] = await db.select().from(datasets).where(and(eq(datasets.workspaceId, workspaceId), eq(datasets.id, id)));
  return found(row, "The data set");
}

function numericColumn(columns: ParsedColumn[], key: string, path = "column"): ParsedColumn {
  const c = columns.find((x) => x.key === key);
  if (!c) throw badRequest(`The data set has no column “${key}”.`, [{ path, message: `no column “${key}”; the columns are ${columns.map((x) => `“${x.key}”`).join(", ")}` }], "unknown_column");
  if (c.kind !== "number") throw badRequest(`Column “${key}” holds labels, not measurements.`, [{ path, message: "a label column cannot be mapped to a tolerance" }], "not_numeric");
  return c;
}

/** Sets or clears the tolerance source of each listed column; the others keep theirs. */
export async function updateMappings(db: Database, actor: Actor, id: string, input: UpdateMappings): Promise<Dataset> {
  const ds = await datasetRow(db, actor.workspaceId, id);
  const columns = ds.columns as unknown as ParsedColumn[];
  const revisionIds = [...new Set(input.mappings.map((m) => m.revisionId))];
  const revs = await db
    .select({ id: stackRevisions.id, number: stackRevisions.number, projectId: stackRevisions.projectId, stack: stackRevisions.stack })
    .from(stackRevisions)
    .where(and(eq(stackRevisions.workspaceId, actor.workspaceId), inArray(stackRevisions.id, revisionIds)));
  const fields: { path: string; message: string }[] = [];
  const planned: Array<{ column: string; revisionId: string; source: string | null; unit: MeasureUnit; nominal: number }> = [];
  input.mappings.forEach((m, i) => {
    const at = (f: string) => `mappings[${i}].${f}`;
    const col = columns.find((c) => c.key === m.column);
    if (!col) return void fields.push({ path: at("column"), message: `no column “${m.column}” in this data set` });
    if (col.kind !== "number") return void fields.push({ path: at("column"), message: `“${m.column}” holds labels, not measurements` });
    const rev = revs.find((r) => r.id === m.revisionId);
    if (!rev || rev.projectId !== ds.projectId) return void fields.push({ path: at("revisionId"), message: "no stack revision with this id in the data set's project" });
    if (m.source === null) return void planned.push({ column: m.column, revisionId: rev.id, source: null, unit: col.unit ?? "um", nominal: 0 });
    const src = findSource(rev.stack as StackFile, m.source);
    if (!src) return void fields.push({ path: at("source"), message: `stack revision ${rev.number} has no tolerance source “${m.source}”` });
    if (col.unit && m.unit && m.unit !== col.unit) {
      return void fields.push({ path: at("unit"), message: `the header of “${m.column}” says ${col.unit}; leave out the unit or use ${col.unit}` });
    }
    const unit = m.unit ?? col.unit;
    if (!unit) return void fields.push({ path: at("unit"), message: `“${m.column}” has no unit in its header: give one of um, mm, deg, mrad, arcmin` });
    if (conversionFactor(unit, src.unit) === null) {
      const what = src.unit === "um" ? "a height or offset in µm" : "an angle in degrees";
      return void fields.push({ path: at("unit"), message: `${m.source} is ${what}; a column in ${unitText(unit)} cannot measure it` });
    }
    planned.push({ column: m.column, revisionId: rev.id, source: m.source, unit, nominal: m.nominal ?? 0 });
  });
  if (fields.length) throw badRequest(fields.length === 1 ? "A mapping is not valid; nothing was changed." : `${fields.length} mappings are not valid; nothing was changed.`, fields, "invalid_mapping");

  await db.transaction(async (tx) => {
    for (const p of planned) {
      await tx.delete(datasetMappings).where(and(eq(datasetMappings.datasetId, id), eq(datasetMappings.column, p.column)));
      if (p.source === null) continue;
      await tx.insert(datasetMappings).values({ datasetId: id, column: p.column, revisionId: p.revisionId, source: p.source, unit: p.unit, nominal: p.nominal, updatedBy: actor.userId });
    }
    const set = planned.filter((p) => p.source !== null);
    const cleared = planned.filter((p) => p.source === null);
    const parts = [
      ...set.map((p) => `“${p.column}” → ${p.source} (rev ${revs.find((r) => r.id === p.revisionId)!.number}, ${unitText(p.unit)})`),
      ...cleared.map((p) => `“${p.column}” unmapped`),
    ];
    await recordActivity(tx, {
      workspaceId: actor.workspaceId,
      projectId: ds.projectId,
      actorId: actor.userId,
      action: "dataset.mapped",
      summary: `mapped the data set “${ds.name}”: ${parts.join("; ")}`,
      data: { datasetId: id },
    });
  });
  return getDataset(db, actor.workspaceId, id);
}

export async function deleteDataset(db: Database, actor: Actor, id: string) {
  const ds = await datasetRow(db, actor.workspaceId, id);
  await db.transaction(async (tx) => {
    await tx.delete(datasets).where(eq(datasets.id, id));
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

/**
 * The values of a measured column in the unit of the source it is mapped to, with the
 * mapping's nominal taken off: the deviations the engine draws.
 */
export function convertedValues(raw: number[], unit: MeasureUnit, nominal: number, to: SourceUnit): { values: number[]; factor: number } {
  const factor = conversionFactor(unit, to);
  if (factor === null) throw badRequest(`A column in ${unitText(unit)} cannot measure a source in ${unitText(to)}.`, undefined, "invalid_mapping");
  return { values: raw.map((v) => (v - nominal) * factor), factor };
}

/** Summary, normality, capability against the mapped tolerance, outliers and the histogram of one column. */
export async function datasetStatistics(db: Database, workspaceId: string, id: string, column: string): Promise<DatasetStatistics> {
  const ds = await datasetRow(db, workspaceId, id);
  const col = numericColumn(ds.columns as unknown as ParsedColumn[], column);
  const raw = ds.data[col.key] as number[];
  const [m] = await db
    .select({ source: datasetMappings.source, unit: datasetMappings.unit, nominal: datasetMappings.nominal, stack: stackRevisions.stack })
    .from(datasetMappings)
    .innerJoin(stackRevisions, eq(stackRevisions.id, datasetMappings.revisionId))
    .where(and(eq(datasetMappings.datasetId, id), eq(datasetMappings.column, col.key)));
  let values = raw;
  let unit: string | null = col.unit;
  let converted: DatasetStatistics["converted"] = null;
  let tolerance: DatasetStatistics["tolerance"] = null;
  let limits: { lsl: number; usl: number } | null = null;
  const src = m ? findSource(m.stack as StackFile, m.source) : null;
  if (m && src) {
    const c = convertedValues(raw, m.unit as MeasureUnit, m.nominal, src.unit);
    values = c.values;
    unit = src.unit;
    converted = { from: m.unit as MeasureUnit, factor: c.factor, nominal: m.nominal };
    const t = src.tolerance;
    const sigma = t.dist === "data" || t.tol === undefined ? null : t.dist === "normal" ? t.tol / (t.sigmas ?? 3) : t.dist === "uniform" ? t.tol / Math.sqrt(3) : t.tol / Math.sqrt(6);
    tolerance = { dist: t.dist, tol: t.tol ?? null, sigmas: t.dist === "normal" ? (t.sigmas ?? 3) : null, mean: t.mean ?? 0, sigma };
    limits = toleranceLimits(t);
  }
  const s = summarize(values);
  const ad = andersonDarling(values);
  const rowNumbers = ds.rowNumbers;
  return {
    column: col.key,
    unit,
    converted,
    source: m?.source ?? null,
    summary: s,
    normality: ad,
    normalityNote: ad ? null : s.n < AD_MIN_N ? `The normality test needs at least ${AD_MIN_N} values; this column has ${s.n}.` : "Every value is the same: there is no spread to test.",
    tolerance,
    capability: limits ? capability(values, limits.lsl, limits.usl) : null,
    outliers: {
      rule: `modified z-score |0.6745·(x − median)/MAD| > ${OUTLIER_LIMIT} (Iglewicz and Hoaglin)`,
      values: outliers(values).map((o) => ({ row: rowNumbers[o.index], value: o.value, score: o.score })),
    },
    histogram: histogram(values, limits),
  };
}

/**
 * One column of a data set as an as-built study uses it: in the unit of `source`, checked
 * against the column's mapping (a column mapped to another source is refused).
 */
export async function columnForSource(
  db: Pick<Database, "select">,
  workspaceId: string,
  projectId: string,
  datasetId: string,
  column: string,
  source: string,
  sourceUnit: SourceUnit,
  path: string,
) {
  const [ds] = await db.select().from(datasets).where(and(eq(datasets.workspaceId, workspaceId), eq(datasets.id, datasetId)));
  if (!ds || ds.projectId !== projectId) throw badRequest("A data set of the as-built study is not in this project.", [{ path: `${path}.datasetId`, message: "no data set with this id in the revision's project" }], "invalid_as_built");
  const cols = ds.columns as unknown as ParsedColumn[];
  const col = cols.find((c) => c.key === column);
  if (!col || col.kind !== "number") {
    throw badRequest(`Data set “${ds.name}” has no measured column “${column}”.`, [{ path: `${path}.column`, message: `no measured column “${column}” in “${ds.name}”` }], "invalid_as_built");
  }
  const [m] = await db.select().from(datasetMappings).where(and(eq(datasetMappings.datasetId, datasetId), eq(datasetMappings.column, column)));
  if (m && m.source !== source) {
    throw badRequest(`Column “${column}” is mapped to ${m.source}, not ${source}.`, [{ path: `${path}.source`, message: `“${column}” of “${ds.name}” measures ${m.source}; map it to ${source} first` }], "invalid_as_built");
  }
  const unit = (m?.unit as MeasureUnit | undefined) ?? col.unit;
  if (!unit) {
    throw badRequest(`Column “${column}” has no unit.`, [{ path: `${path}.column`, message: `give “${column}” a unit by mapping it to ${source}` }], "invalid_as_built");
  }
  if (conversionFactor(unit, sourceUnit) === null) {
    throw badRequest(`Column “${column}” is in ${unitText(unit)}; ${source} is in ${unitText(sourceUnit)}.`, [{ path: `${path}.column`, message: `a column in ${unitText(unit)} cannot replace ${source}` }], "invalid_as_built");
  }
  const { values } = convertedValues(ds.data[column] as number[], unit, m?.nominal ?? 0, sourceUnit);
  return { name: ds.name, values };
}
