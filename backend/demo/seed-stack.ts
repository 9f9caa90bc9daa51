import type { StackFile } from "@shared/schemas/stack-file";
import type { Database } from "../db/client";
import { comments, stackRevisions, studies } from "../db/schema";
import { recordActivity } from "../services/activity";
import { fieldAtSite } from "../services/geomagnetic";
import approvedStack from "./ridgeline-stack.json" with { type: "json" };
import draftStack from "./ridgeline-stack-draft.json" with { type: "json" };

/** Invented requirements of the demo product's system team. */
export const DEMO_REQUIREMENTS = [
  { metric: "heading.maxAbsDeg", max: 2.0, yield: 0.99 },
  { metric: "mag.crossAxisTotalPct.x", max: 2.0, yield: 0.9973 },
  { metric: "accel~mag.relRotDeg", max: 0.5, yield: 0.9973 },
  { metric: "gyro.crossAxisTotalPct.x", max: 2.0, yield: 0.9973 },
];

/** Where the demo product is used: an invented test range in the Alps, mid-2026. */
export const DEMO_SITE = { latitudeDeg: 47.27, longitudeDeg: 11.39, altitudeKm: 0.6, date: "2026-06-01" };

type Ctx = { workspaceId: string; projectId: string; userIds: Record<string, string> };

/**
 * The demo project's stack: revision 1 approved by the reviewer with a queued study (the queue
 * runs it as soon as the server starts), and revision 2, a newer draft.
 */
export async function seedDemoStack(db: Database, ctx: Ctx) {
  const field = fieldAtSite(DEMO_SITE);
  await db.transaction(async (tx) => {
    const now = Date.now();
    const [rev1] = await tx
      .insert(stackRevisions)
      .values({
        workspaceId: ctx.workspaceId,
        projectId: ctx.projectId,
        number: 1,
        status: "approved",
        stack: approvedStack as StackFile,
        requirements: DEMO_REQUIREMENTS,
        note: "Baseline for the first build: epoxy die attach throughout.",
        createdBy: ctx.userIds.engineer,
        submittedAt: new Date(now - 3 * 86_400_000),
        submittedBy: ctx.userIds.engineer,
        approvedAt: new Date(now - 2 * 86_400_000),
        approvedBy: ctx.userIds.reviewer,
      })
      .returning();
    await tx.insert(comments).values({
      workspaceId: ctx.workspaceId,
      projectId: ctx.projectId,
      targetType: "revision",
      targetId: rev1.id,
      authorId: ctx.userIds.reviewer,
      kind: "approved",
      body: "Approved for the first build. Watch the magnetometer bond line: it is the smallest die on the softest attach.",
    });
    await tx.insert(stackRevisions).values({
      workspaceId: ctx.workspaceId,
      projectId: ctx.projectId,
      number: 2,
      status: "draft",
      stack: draftStack as StackFile,
      requirements: DEMO_REQUIREMENTS,
      note: "Trying die-attach film under the magnetometer.",
      basedOnId: rev1.id,
      createdBy: ctx.userIds.engineer,
    });
    const [study] = await tx
      .insert(studies)
      .values({
        workspaceId: ctx.workspaceId,
        projectId: ctx.projectId,
        revisionId: rev1.id,
        number: 1,
        label: "Baseline, no calibration",
        study: {
          format: "orthostack.study/1",
          trials: 200_000,
          seed: 2026,
          inclinationDeg: Math.round(field.inclinationDeg * 1e4) / 1e4,
          headingStepDeg: 10,
          calibration: { after: "none" },
          requirements: DEMO_REQUIREMENTS,
        },
        stack: approvedStack as StackFile,
        site: field,
        trialsTotal: 200_000,
        createdBy: ctx.userIds.engineer,
      })
      .returning();
    for (const [action, summary] of [
      ["revision.created", "started stack revision 1"],
      ["revision.approved", "approved stack revision 1"],
      ["revision.created", "started stack revision 2"],
      ["study.queued", "queued study 1 on stack revision 1 (200,000 trials, seed 2026)"],
    ] as const) {
      await recordActivity(tx, {
        workspaceId: ctx.workspaceId,
        projectId: ctx.projectId,
        actorId: action === "revision.approved" ? ctx.userIds.reviewer : ctx.userIds.engineer,
        action,
        summary,
        data: { studyId: study.id },
      });
    }
  });
}
