import type { QueryClient } from "@tanstack/react-query";
import { useSuspenseQuery } from "@tanstack/react-query";
import { data, Link, useParams, useSearchParams, type LoaderFunctionArgs } from "react-router";
import { IdSchema } from "@shared/schemas/common";
import type { StackFile } from "@shared/schemas/stack-file";
import { ChevronLeftIcon } from "@frontend/components/ui/icons";
import { useMe } from "@frontend/features/auth/api/get-me";
import { ArchivedProjectNotice, isArchived } from "@frontend/features/projects";
import { projectQueryOptions, useProject } from "@frontend/features/projects/api/get-project";
import { revisionQueryOptions, studyQueryOptions } from "@frontend/features/studies";
import { SegmentedControl } from "@frontend/features/studies/components/segmented-control";
import { AllocationPanel, CompassMapPanel, SweepPanel } from "@frontend/features/what-if";
import { isApiError } from "@frontend/lib/api-client";
import { can } from "@frontend/lib/permissions";
import { requirePermission } from "../../route-guards";
import { formatCount } from "@shared/format";

const notFound = () => data({ message: "This study does not exist, or it was removed." }, { status: 404 });
type Tab = "sweep" | "allocation" | "map";
const TABS: { value: Tab; label: string }[] = [
  { value: "sweep", label: "Sweep a parameter" },
  { value: "allocation", label: "Allocate tolerances" },
  { value: "map", label: "Where the compass holds" },
];

/** What if: sweeps, allocation and the world map, started from a study's settings on its revision. */
export const whatIfRoute = (queryClient: QueryClient) => ({
  loader: async ({ request, params }: LoaderFunctionArgs) => {
    const projectId = IdSchema.safeParse(params.id);
    const studyId = IdSchema.safeParse(new URL(request.url).searchParams.get("study"));
    if (!projectId.success || !studyId.success) throw notFound();
    try {
      const [, , study] = await Promise.all([
        requirePermission(queryClient, request, "projects.read"),
        queryClient.ensureQueryData(projectQueryOptions(projectId.data)),
        queryClient.ensureQueryData(studyQueryOptions(studyId.data)),
      ]);
      if (study.projectId !== projectId.data) throw notFound();
      await queryClient.ensureQueryData(revisionQueryOptions(study.revisionId));
    } catch (error) {
      if (isApiError(error) && error.status === 404) throw notFound();
      throw error;
    }
    return null;
  },
  Component: WhatIfRoute,
});

export function WhatIfRoute() {
  const { id = "" } = useParams();
  const [params, setParams] = useSearchParams();
  const { data: project } = useProject(id);
  const { data: study } = useSuspenseQuery(studyQueryOptions(params.get("study") ?? ""));
  const { data: revision } = useSuspenseQuery(revisionQueryOptions(study.revisionId));
  const me = useMe();
  // an archived project is read-only (the server refuses the change): no run, cancel or apply here
  const open = !isArchived(project);
  const canRun = open && can(me.role, "whatif.run");
  const canApply = open && can(me.role, "revisions.write");
  const tab = (TABS.find((t) => t.value === params.get("tab"))?.value ?? "sweep") as Tab;
  const run = params.get("run");
  const set = (patch: Record<string, string | null>) =>
    setParams(
      (p) => {
        const next = new URLSearchParams(p);
        for (const [k, v] of Object.entries(patch)) {
          if (v === null) next.delete(k);
          else next.set(k, v);
        }
        return next;
      },
      { replace: false },
    );
  const stack = revision.stack as StackFile;
  const studyFile = { ...study.study, requirements: study.study.requirements ?? revision.requirements };
  const common = { revisionId: revision.id, study: studyFile, canRun, runId: run, onRun: (r: string) => set({ run: r }) };

  return (
    <>
      <Link
        to={`/projects/${project.id}/studies/${study.id}`}
        className="mb-3 inline-flex items-center gap-1 text-xs font-semibold text-ink/55 hover:text-ink"
      >
        <ChevronLeftIcon size={14} /> Study {study.number}
      </Link>
      <div className="mb-4 flex flex-wrap items-end justify-between gap-4">
        <div>
          <h1 className="text-[22px] leading-7 font-extrabold tracking-[-0.015em] text-ink">What if</h1>
          <p className="mt-1 text-[13px] text-ink/65 tabular-nums">
            {project.name} · stack revision {revision.number} ({revision.status}) · settings of study {study.number} ·{" "}
            {studyFile.requirements?.length ?? 0} requirements · seed {study.seed} · {formatCount(study.trials)} trials in the study
          </p>
        </div>
        <SegmentedControl label="What to work out" value={tab} options={TABS} onChange={(t) => set({ tab: t, run: null })} />
      </div>
      <ArchivedProjectNotice project={project} toDo="run, cancel or apply sweeps and allocations" />
      {tab === "sweep" ? <SweepPanel key="sweep" stack={stack} {...common} /> : null}
      {tab === "allocation" ? (
        <AllocationPanel key="allocation" projectId={project.id} stack={stack} canApply={canApply} {...common} />
      ) : null}
      {tab === "map" ? <CompassMapPanel key="map" {...common} /> : null}
    </>
  );
}
