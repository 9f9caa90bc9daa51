/** Mapping a data set's columns to the tolerance sources of a stack revision. */
import { and, eq, inArray } from "drizzle-orm";
import type { Dataset, UpdateMappings } from "@shared/schemas/datasets";
import { findSource, type StackSource } from "@shared/datasets/sources";
import { conversionFactor, type MeasureUnit } from "@shared/datasets/units";
import { unitText } from "@shared/format";
import type { StackFile } from "@shared/schemas/stack-file";
import type { Database } from "../db/client";
import { datasetMappings, datasets, stackRevisions } from "../db/schema";
import { badRequest, type FieldError } from "../lib/errors";
import { requireVersion, writeVersioned } from "../lib/versions";
import type { Actor } from "../middleware/session";
import { recordActivity } from "./activity";

import { datasetRow, getDataset } from "./datasets";
import { assertProjectOpen } from "./project-records";

/** Sets or clears the tolerance source of each listed column; the others keep theirs. */
export async function updateMappings(
  db: Database,
  actor: Actor,
  id: string,
  input: UpdateMappings,
  sent: number | undefined,
): Promise<Dataset> {
  const ds = await datasetRow(db, actor.workspaceId, id);
  await assertProjectOpen(db, actor.workspaceId, ds.projectId);
  const expected = requireVersion(`The data set “${ds.name}”`, ds.version, sent);
  const columns = ds.columns;
  const revisionIds = [...new Set(input.mappings.map((m) => m.revisionId))];
  const revs = await db
    .select({ id: stackRevisions.id, number: stackRevisions.number, projectId: stackRevisions.projectId, stack: stackRevisions.stack })
    .from(stackRevisions)
    .where(and(eq(stackRevisions.workspaceId, actor.workspaceId), inArray(stackRevisions.id, revisionIds)));
  const fields: FieldError[] = [];
  const planned: Array<{
    column: string;
    revisionId: string;
    source: string | null;
    part: number | null;
    unit: MeasureUnit;
    nominal: number;
  }> = [];
  input.mappings.forEach((m, i) => {
    const at = (f: string) => `mappings[${i}].${f}`;
    const col = columns.find((c) => c.key === m.column);
    if (!col) return void fields.push({ path: at("column"), message: `no column “${m.column}” in this data set` });
    if (col.kind !== "number") return void fields.push({ path: at("column"), message: `“${m.column}” holds labels, not measurements` });
    const rev = revs.find((r) => r.id === m.revisionId);
    if (!rev || rev.projectId !== ds.projectId)
      return void fields.push({ path: at("revisionId"), message: "no stack revision with this id in the data set's project" });
    if (m.source === null)
      return void planned.push({ column: m.column, revisionId: rev.id, source: null, part: null, unit: col.unit ?? "um", nominal: 0 });
    const src = findSource(rev.stack as StackFile, m.source);
    if (!src)
      return void fields.push({ path: at("source"), message: `stack revision ${rev.number} has no tolerance source “${m.source}”` });
    const part = partOf(src, m.support, m.component);
    if (typeof part === "string") return void fields.push({ path: at(m.support !== undefined ? "support" : "component"), message: part });
    if (col.unit && m.unit && m.unit !== col.unit) {
      return void fields.push({
        path: at("unit"),
        message: `the header of “${m.column}” says ${col.unit}; leave out the unit or use ${col.unit}`,
      });
    }
    const unit = m.unit ?? col.unit;
    if (!unit)
      return void fields.push({
        path: at("unit"),
        message: `“${m.column}” has no unit in its header: give one of um, mm, deg, mrad, arcmin`,
      });
    if (conversionFactor(unit, src.unit) === null) {
      const what = src.unit === "um" ? "a height or offset in µm" : "an angle in degrees";
      return void fields.push({ path: at("unit"), message: `${m.source} is ${what}; a column in ${unitText(unit)} cannot measure it` });
    }
    // the design value from the stack (bond-line thickness, position, yaw) in the column's unit
    const nominal = m.nominal ?? src.nominal / conversionFactor(unit, src.unit)!;
    planned.push({ column: m.column, revisionId: rev.id, source: m.source, part, unit, nominal });
  });
  if (!fields.length) {
    // after this change: one column per part of a pooled source, and a source either pooled or single
    const existing = await db
      .select({
        column: datasetMappings.column,
        revisionId: datasetMappings.revisionId,
        source: datasetMappings.source,
        part: datasetMappings.part,
      })
      .from(datasetMappings)
      .where(eq(datasetMappings.datasetId, id));
    const after = [...existing.filter((e) => !planned.some((p) => p.column === e.column)), ...planned.filter((p) => p.source !== null)];
    planned.forEach((p) => {
      if (p.source === null) return;
      const i = input.mappings.findIndex((m) => m.column === p.column);
      const same = after.filter((o) => o.column !== p.column && o.revisionId === p.revisionId && o.source === p.source);
      const twin = same.find((o) => o.part === p.part);
      if (twin && p.part !== null)
        fields.push({
          path: `mappings[${i}].${typeof input.mappings[i].support === "number" ? "support" : "component"}`,
          message: `“${twin.column}” already measures this part of ${p.source}`,
        });
      else if (same.some((o) => (o.part === null) !== (p.part === null))) {
        fields.push({
          path: `mappings[${i}].source`,
          message: `${p.source} is mapped both as one column and as several: give every column its part, or map one column`,
        });
      }
    });
  }
  if (fields.length)
    throw badRequest(
      fields.length === 1
        ? "A mapping is not valid; nothing was changed."
        : `${fields.length} mappings are not valid; nothing was changed.`,
      fields,
      "invalid_mapping",
    );

  await db.transaction(async (tx) => {
    await writeVersioned(tx, datasets, id, expected, `The data set “${ds.name}”`);
    for (const p of planned) {
      await tx.delete(datasetMappings).where(and(eq(datasetMappings.datasetId, id), eq(datasetMappings.column, p.column)));
      if (p.source === null) continue;
      await tx.insert(datasetMappings).values({
        datasetId: id,
        column: p.column,
        revisionId: p.revisionId,
        source: p.source,
        part: p.part,
        unit: p.unit,
        nominal: p.nominal,
        updatedBy: actor.userId,
      });
    }
    const set = planned.filter((p) => p.source !== null);
    const cleared = planned.filter((p) => p.source === null);
    const parts = [
      ...set.map(
        (p) =>
          `“${p.column}” → ${p.source}${p.part !== null ? ` part ${p.part}` : ""} (rev ${revs.find((r) => r.id === p.revisionId)!.number}, ${unitText(p.unit)})`,
      ),
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

/**
 * The part a column is of a pooled source, or null for a source taken as one column; a
 * string is the reason it is refused.
 */
function partOf(src: StackSource, support: number | undefined, component: string | undefined): number | null | string {
  const kind = src.id.endsWith(".bondLine") ? "support" : src.id.endsWith(".tilt") ? "tilt" : src.id.endsWith(".axis") ? "axis" : null;
  if (support !== undefined) {
    if (kind !== "support") return `${src.id} has no support points: support applies to a bond line`;
    if (support >= src.parts!.length)
      return `${src.id} rests on ${src.parts!.length} support points, numbered 0 to ${src.parts!.length - 1}`;
    return support;
  }
  if (component !== undefined) {
    if (kind === "tilt" && (component === "x" || component === "y")) return component === "x" ? 0 : 1;
    if (kind === "axis" && /^g[1-6]$/.test(component)) return Number(component.slice(1)) - 1;
    return kind === "tilt"
      ? `${src.id} has the components x and y`
      : kind === "axis"
        ? `${src.id} has the components g1 to g6`
        : `${src.id} is one quantity: leave out component`;
  }
  // the pooled tilt exists only as two columns; a bond line or a single axis tolerance may also take one column for every draw
  if (kind === "tilt") return `${src.id} pools x and y: give component "x" or "y" (or map to ${src.elementId}.tiltX / .tiltY)`;
  if (kind === "axis" && !findAxisSingle(src)) return `${src.id} pools the six axis angles: give component g1..g6`;
  return null;
}

/** The single axis tolerance when a sensor's six angles share one (so one column may stand for all six). */
function findAxisSingle(src: StackSource) {
  const t = src.parts?.[0]?.tolerance;
  return src.parts?.every((p) => p.tolerance === t) ? t : undefined;
}
