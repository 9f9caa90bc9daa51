/**
 * Invented demo data: the first build of the Ridgeline module, 48 units measured at the
 * assembly house after die attach of the magnetometer. Placement rotation in mrad (the
 * bonder's report unit) and the magnetometer's bond-line height at one corner in um. One
 * unit, RB1-031, was re-picked by hand and sits far out. The numbers come from a seeded
 * generator, not from any real line.
 */
import { createHash } from "node:crypto";
import { and, eq } from "drizzle-orm";
import { normInv } from "@shared/engine/distributions";
import { datasetMappings, datasets, stackRevisions } from "../db/schema";
import type { SeedStep } from "../seed";
import { recordActivity } from "../services/activity";
import { readMeasurementFile } from "../services/dataset-files";

export const DEMO_DATASET_NAME = "ridgeline-first-build-mag.csv";

/** A small fixed generator (xorshift32) so the demo file is the same on every machine. */
function stream(seed: number) {
  let x = seed >>> 0 || 1;
  return () => {
    x ^= x << 13;
    x >>>= 0;
    x ^= x >>> 17;
    x ^= x << 5;
    x >>>= 0;
    return (x + 0.5) / 4294967296;
  };
}

export function demoDatasetCsv(): string {
  const u = stream(20260917);
  const lines = ["unit,yaw [mrad],bond line corner A [um]"];
  for (let i = 1; i <= 48; i++) {
    const id = `RB1-${String(i).padStart(3, "0")}`;
    const yaw = i === 31 ? 11.4 : 1.1 + 1.8 * normInv(u());
    const bond = 10.6 + 0.75 * normInv(u());
    lines.push(`${id},${yaw.toFixed(2)},${bond.toFixed(1)}`);
  }
  return lines.join("\r\n") + "\r\n";
}

export const seedDemoDatasets: SeedStep = async (db, ctx) => {
  const buf = Buffer.from(demoDatasetCsv(), "utf8");
  const parsed = await readMeasurementFile(DEMO_DATASET_NAME, buf);
  const [rev1] = await db
    .select({ id: stackRevisions.id })
    .from(stackRevisions)
    .where(and(eq(stackRevisions.projectId, ctx.projectId), eq(stackRevisions.number, 1)));
  const id = await db.transaction(async (tx) => {
    const [ds] = await tx
      .insert(datasets)
      .values({
        workspaceId: ctx.workspaceId,
        projectId: ctx.projectId,
        name: DEMO_DATASET_NAME,
        fileType: "csv",
        sheet: null,
        sizeBytes: buf.length,
        sha256: createHash("sha256").update(buf).digest("hex"),
        rowCount: parsed.rowNumbers.length,
        columns: parsed.columns,
        data: parsed.data,
        preview: parsed.preview,
        rowNumbers: parsed.rowNumbers,
        file: buf,
        uploadedBy: ctx.userIds.engineer,
        uploaderRole: "engineer",
      })
      .returning({ id: datasets.id });
    await recordActivity(tx, {
      workspaceId: ctx.workspaceId,
      projectId: ctx.projectId,
      actorId: ctx.userIds.engineer,
      action: "dataset.uploaded",
      summary: `uploaded the data set “${DEMO_DATASET_NAME}” (48 rows, 2 measured columns)`,
      data: { datasetId: ds.id },
    });
    return ds.id;
  });
  // its own transaction, so the activity list shows the upload before the mapping
  if (rev1) {
    await db.transaction(async (tx) => {
      await tx.insert(datasetMappings).values({
        datasetId: id,
        column: "yaw [mrad]",
        revisionId: rev1.id,
        source: "mag.yaw",
        unit: "mrad",
        nominal: 0,
        updatedBy: ctx.userIds.engineer,
      });
      await recordActivity(tx, {
        workspaceId: ctx.workspaceId,
        projectId: ctx.projectId,
        actorId: ctx.userIds.engineer,
        action: "dataset.mapped",
        summary: `mapped the data set “${DEMO_DATASET_NAME}”: “yaw [mrad]” → mag.yaw (rev 1, mrad)`,
        data: { datasetId: id },
      });
    });
  }
};
