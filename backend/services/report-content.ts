/**
 * What a supplier's report says, computed once from an approved revision, a finished study
 * and the supplier: the content is frozen into the report row, so the PDF, the spreadsheet
 * and the CSV all print the same numbers, today and after release.
 */
import * as z from "zod";
import { capabilityAsk } from "@shared/reports/capability";
import { REPORT_CAUTIONS } from "@shared/reports/cautions";
import { unitText } from "@shared/format";
import { metricLabel, metricUnit } from "@shared/metrics";
import { matchOwner, toleranceSources, type ToleranceSource } from "@shared/reports/sources";
import { ContributorsSchema, EnvelopeSchema, RequirementResultSchema } from "@shared/schemas/result-file";
import type { ReportContent, ReportRequirement, ReportTolerance } from "@shared/schemas/reports";
import type { StackFile, Tolerance } from "@shared/schemas/stack-file";
import { drawnElements } from "@shared/stack-drawing";
import type { Study } from "@shared/schemas/studies";
import { badRequest, conflict } from "../lib/errors";

/** A requirement is "fed" by a supplier when its tolerances carry at least this share of it. */
export const FED_SHARE = 0.01;
/** A source is listed under a requirement from this share on. */
const LISTED_SHARE = 0.001;
const CHART_BARS = 8;

/** What the report needs of a result file; older or partial results still give a report. */
const ResultForReportSchema = z.object({
  engine: z.string().default(""),
  trials: z.number().int(),
  seed: z.number(),
  sampling: z.string().default("random"),
  requirements: z.array(RequirementResultSchema.partial({ ppmOut: true, demonstrated: true, limitAtTarget: true })).default([]),
  contributors: z.array(ContributorsSchema).default([]),
  envelope: EnvelopeSchema.nullable().default(null),
});

export type ReportInputs = {
  project: { id: string; name: string };
  revision: { id: string; number: number; status: string; stack: StackFile; approvedAt: Date | null; approvedByName: string | null };
  study: Study;
  supplier: { id: string; name: string; kind: string };
  capability: { cpk: number; overrides: Record<string, number> };
};

const stable = (v: unknown): string =>
  v === null || typeof v !== "object"
    ? JSON.stringify(v)
    : Array.isArray(v)
      ? `[${v.map(stable).join(",")}]`
      : `{${Object.keys(v as object)
          .sort()
          .map((k) => `${JSON.stringify(k)}:${stable((v as Record<string, unknown>)[k])}`)
          .join(",")}}`;

function describeTolerance(t: Tolerance | undefined): string | null {
  if (!t) return null;
  if (t.dist === "data") return `measured data (${t.values?.length ?? 0} values)`;
  const mean = t.mean ? `, mean ${t.mean}` : "";
  return `${t.dist} ±${t.tol}°${t.dist === "normal" && t.sigmas && t.sigmas !== 3 ? ` (${t.sigmas} σ)` : ""}${mean}`;
}

/** The supplier's sources of a stack (owner names the company, or its id). */
export function supplierSources(stack: StackFile, supplier: { id: string; name: string }): ToleranceSource[] {
  return toleranceSources(stack).filter((s) => matchOwner(s.owner, [supplier]) !== null);
}

/** Checks that a report may be built from this study, and why not otherwise (null: it may). */
export function reportBlocker(
  /** `result` is only tested for presence: a list may pass any object for a stored one */
  study: Pick<Study, "status" | "number" | "stack"> & { result: object | null },
  revision: { number: number; status: string; stack: StackFile },
): string | null {
  if (revision.status !== "approved")
    return `Stack revision ${revision.number} is not approved. Reports are built from approved revisions only.`;
  if (study.status !== "finished" || !study.result)
    return `Study ${study.number} is ${study.status}. Reports are built from finished studies only.`;
  if (stable(study.stack) !== stable(revision.stack)) {
    return `Study ${study.number} ran on an earlier state of stack revision ${revision.number}. Run a study on the approved revision.`;
  }
  return null;
}

export function buildReportContent(input: ReportInputs, builtAt = new Date()): ReportContent {
  const { project, revision, study, supplier, capability } = input;
  const blocked = reportBlocker(study, revision);
  if (blocked) throw conflict(blocked, "not_reportable");
  const parsed = ResultForReportSchema.safeParse(study.result);
  if (!parsed.success)
    throw conflict(`The result of study ${study.number} cannot be read for a report. Run the study again.`, "not_reportable");
  const result = parsed.data;
  const stack = revision.stack;

  const ours = supplierSources(stack, supplier);
  if (ours.length === 0) {
    throw conflict(
      `No tolerance of stack revision ${revision.number} names ${supplier.name} as its owner. Set the owner in the stack editor's tolerance table.`,
      "no_tolerances",
    );
  }
  const ourIds = new Set(ours.map((s) => s.id));
  const unknown = Object.keys(capability.overrides).filter((k) => !ourIds.has(k));
  if (unknown.length) {
    throw badRequest(
      `Capability overrides must name ${supplier.name}'s own sources.`,
      unknown.map((k) => ({ path: `cpkOverrides.${k}`, message: `${k} is not one of ${supplier.name}'s tolerances in this revision` })),
    );
  }

  const contributorsOf = new Map(result.contributors.map((c) => [c.metric, c]));
  const shareOf = (metric: string, source: string) => {
    const c = contributorsOf.get(metric);
    const s = c?.sources.find((x) => x.source === source);
    return s ? (Number.isFinite(s.linearShare) ? s.linearShare : (s.mcShare ?? 0)) : 0;
  };

  const requirements: ReportRequirement[] = result.requirements.map((r) => {
    const c = contributorsOf.get(r.metric);
    const share = c ? ours.reduce((sum, s) => sum + shareOf(r.metric, s.id), 0) : null;
    return {
      metric: r.metric,
      description: metricLabel(r.metric),
      unit: unitText(metricUnit(r.metric)),
      max: r.max,
      yield: r.yield,
      predictedYield: r.predictedYield,
      ci: r.ci,
      ppmOut: r.ppmOut ?? (1 - r.predictedYield) * 1e6,
      passes: r.passes,
      supplierShare: share,
      fed: share !== null && share >= FED_SHARE,
    };
  });

  const tolerances: ReportTolerance[] = ours.map((s) => {
    const chosen = capability.overrides[s.id] ?? capability.cpk;
    const ask = capabilityAsk(s.tolerance, chosen);
    return {
      source: s.id,
      elementId: s.elementId,
      elementName: s.elementName,
      elementKind: s.elementKind,
      quantity: s.quantity,
      unit: s.unit,
      stage: s.stage,
      dist: s.tolerance.dist,
      tol: s.tolerance.tol ?? null,
      sigmas: s.tolerance.dist === "normal" ? (s.tolerance.sigmas ?? 3) : null,
      mean: s.tolerance.mean ?? 0,
      draws: s.draws,
      owner: s.owner ?? supplier.name,
      cpk: ask.cpk,
      cpkChosen: ask.cpkChosen,
      raised: ask.raised,
      sigmaMax: ask.sigmaMax,
      sigmaModelled: ask.sigmaModelled,
      feeds: result.requirements
        .map((r) => ({ metric: r.metric, share: shareOf(r.metric, s.id) }))
        .filter((f) => f.share >= LISTED_SHARE)
        .sort((a, b) => b.share - a.share),
    };
  });

  // Charts for the requirements this supplier feeds; if it feeds none, for every requirement.
  const charted = requirements.some((r) => r.fed) ? requirements.filter((r) => r.fed) : requirements;
  const contributors = charted.flatMap((r) => {
    const c = contributorsOf.get(r.metric);
    if (!c) return [];
    const ranked = c.sources
      .map((s) => ({
        source: s.source,
        share: Number.isFinite(s.linearShare) ? s.linearShare : (s.mcShare ?? 0),
        ours: ourIds.has(s.source),
      }))
      .filter((s) => s.share > 0)
      .sort((a, b) => b.share - a.share);
    const bars = ranked.slice(0, CHART_BARS);
    // keep every noticeable source of this supplier in the picture, even below the top eight
    for (const s of ranked.slice(CHART_BARS)) if (s.ours && s.share >= LISTED_SHARE && bars.length < CHART_BARS + 4) bars.push(s);
    const total = ranked.reduce((a, s) => a + s.share, 0);
    const drawn = bars.reduce((a, s) => a + s.share, 0);
    return [{ metric: r.metric, description: r.description, basis: c.basis, bars, restShare: Math.max(0, total - drawn) }];
  });

  const sf = study.study as Record<string, unknown>;
  const cal = (sf.calibration ?? { after: "none" }) as { after?: string; residualDeg?: Tolerance };
  const tilts = Array.isArray(sf.tilts)
    ? (sf.tilts as Array<{ pitchDeg: number; rollDeg: number }>)
    : [
        { pitchDeg: 0, rollDeg: 0 },
        { pitchDeg: 30, rollDeg: 0 },
        { pitchDeg: -30, rollDeg: 0 },
        { pitchDeg: 0, rollDeg: 30 },
        { pitchDeg: 0, rollDeg: -30 },
      ];
  const heading = result.requirements.find((r) => r.metric === "heading.maxAbsDeg");

  const byElement = new Map<string, string[]>();
  for (const s of ours) byElement.set(s.elementId, [...(byElement.get(s.elementId) ?? []), s.id]);
  const drawn = drawnElements(stack);

  return {
    format: "orthostack.report/1",
    builtAt: builtAt.toISOString(),
    project,
    revision: {
      id: revision.id,
      number: revision.number,
      name: stack.name ?? "",
      approvedAt: revision.approvedAt ? revision.approvedAt.toISOString() : null,
      approvedByName: revision.approvedByName,
    },
    study: {
      id: study.id,
      number: study.number,
      label: study.label,
      finishedAt: study.finishedAt,
      trials: result.trials,
      seed: result.seed,
      engine: result.engine,
      sampling: result.sampling,
      inclinationDeg: Number(sf.inclinationDeg),
      site: study.site ? { ...study.site.site, model: study.site.model } : null,
      calibration: { after: cal.after ?? "none", residual: cal.after && cal.after !== "none" ? describeTolerance(cal.residualDeg) : null },
      headingStepDeg: typeof sf.headingStepDeg === "number" ? sf.headingStepDeg : 10,
      tilts,
      passes: study.passes,
    },
    supplier,
    capability,
    tolerances,
    requirements,
    contributors,
    envelope: result.envelope,
    headingLimit: heading ? heading.max : null,
    // the drawing's view of each element (shared/stack-drawing.ts), with what the report adds
    stack: stack.elements.map((e, i) => ({
      ...drawn[i],
      ...(Array.isArray(e.bondLine?.supports) ? { supports: e.bondLine.supports } : {}),
      sources: byElement.get(e.id) ?? [],
    })),
    cautions: [...REPORT_CAUTIONS],
  };
}
