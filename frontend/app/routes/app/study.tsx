import { useState } from "react";
import type { QueryClient } from "@tanstack/react-query";
import { useSuspenseQuery } from "@tanstack/react-query";
import { data, Link, useParams, type LoaderFunctionArgs } from "react-router";
import { IdSchema } from "@shared/schemas/common";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { ChevronLeftIcon } from "@frontend/components/ui/icons";
import { Panel } from "@frontend/components/ui/panel";
import { useMe } from "@frontend/features/auth/api/get-me";
import { ArchivedProjectNotice, isArchived } from "@frontend/features/projects";
import { projectQueryOptions, useProject } from "@frontend/features/projects/api/get-project";
import { useChangeStudyState } from "@frontend/features/studies/api/change-study-state";
import { studyQueryOptions } from "@frontend/features/studies/api/get-study";
import { StudyStatusBadge, VerdictBadge } from "@frontend/features/studies/components/study-status-badge";
import { StudyProgress } from "@frontend/features/studies/components/study-progress";
import { RunRecord } from "@frontend/features/studies/components/run-record";
import { StudyResults } from "@frontend/features/studies/components/study-results";
import { downloadResultFile, studyFileBase } from "@frontend/features/studies/lib/download";
import { isApiError } from "@frontend/lib/api-client";
import { formatDateTime } from "@frontend/lib/format";
import { can } from "@frontend/lib/permissions";
import { requirePermission } from "../../route-guards";
import { formatCount, formatDeg } from "@shared/format";

const notFound = () => data({ message: "This study does not exist, or it was removed." }, { status: 404 });

export const studyRoute = (queryClient: QueryClient) => ({
  loader: async ({ request, params }: LoaderFunctionArgs) => {
    const projectId = IdSchema.safeParse(params.id);
    const studyId = IdSchema.safeParse(params.studyId);
    if (!projectId.success || !studyId.success) throw notFound();
    try {
      const [, , study] = await Promise.all([
        requirePermission(queryClient, request, "projects.read"),
        queryClient.ensureQueryData(projectQueryOptions(projectId.data)),
        queryClient.ensureQueryData(studyQueryOptions(studyId.data)),
      ]);
      if (study.projectId !== projectId.data) throw notFound();
    } catch (error) {
      if (isApiError(error) && error.status === 404) throw notFound();
      throw error;
    }
    return null;
  },
  Component: StudyRoute,
});

export function StudyRoute() {
  const { id = "", studyId = "" } = useParams();
  const { data: project } = useProject(id);
  const { data: study } = useSuspenseQuery(studyQueryOptions(studyId));
  const me = useMe();
  // an archived project is read-only (the server refuses the change): no run, rerun or cancel here
  const canRun = can(me.role, "studies.run") && !isArchived(project);
  const change = useChangeStudyState();
  const active = study.status === "queued" || study.status === "running";
  const rerunnable = study.status === "interrupted" || study.status === "failed" || study.status === "cancelled";
  const result = study.result;
  const [downloading, setDownloading] = useState(false);
  const [downloadError, setDownloadError] = useState<string | null>(null);
  const download = () => {
    setDownloading(true);
    setDownloadError(null);
    downloadResultFile(study.id, project.name, study.number)
      .catch((e: unknown) => setDownloadError(e instanceof Error ? e.message : "The result file could not be fetched."))
      .finally(() => setDownloading(false));
  };

  return (
    <>
      <Link to={`/projects/${project.id}`} className="mb-3 inline-flex items-center gap-1 text-xs font-semibold text-ink/55 hover:text-ink">
        <ChevronLeftIcon size={14} /> {project.name}
      </Link>

      <div className="mb-4 flex flex-wrap items-start justify-between gap-4">
        <div className="min-w-0">
          <div className="flex flex-wrap items-center gap-2.5">
            <h1 className="text-[22px] leading-7 font-extrabold tracking-[-0.015em] text-ink">
              Study {study.number}
              {study.label ? <span className="font-semibold text-ink/60">: {study.label}</span> : null}
            </h1>
            <StudyStatusBadge status={study.status} />
            {study.status === "finished" ? <VerdictBadge passes={study.passes} /> : null}
          </div>
          <p className="mt-1 text-[13px] text-ink/65 tabular-nums">
            Stack revision {study.revisionNumber} · {formatCount(study.trials)} trials · seed {study.seed} · dip{" "}
            {formatDeg(study.study.inclinationDeg, 4)}
            {study.site ? ` (WMM at ${study.site.site.date})` : ""} · calibration {study.study.calibration?.after ?? "none"} · started{" "}
            {formatDateTime(study.createdAt)} by {study.createdByName ?? "—"}
          </p>
        </div>
        <div className="flex flex-wrap gap-2">
          {result ? (
            <>
              {(["xlsx", "csv"] as const).map((format) => (
                <a
                  key={format}
                  href={`/api/studies/${encodeURIComponent(study.id)}/export?format=${format}`}
                  download
                  className="inline-flex h-8.5 items-center rounded-md border border-line bg-panel px-3.5 text-[13px] font-semibold text-ink hover:border-ink/30 hover:bg-white"
                >
                  {format === "xlsx" ? "Download spreadsheet (XLSX)" : "Download tables (CSV)"}
                </a>
              ))}
              <Button pending={downloading} onClick={download}>
                Download result (JSON)
              </Button>
            </>
          ) : null}
          <Link
            to={`/projects/${project.id}/compare?a=${study.id}`}
            className="inline-flex h-8.5 items-center rounded-md border border-line bg-panel px-3.5 text-[13px] font-semibold text-ink hover:border-ink/30 hover:bg-white"
          >
            Compare
          </Link>
          <Link
            to={`/projects/${project.id}/what-if?study=${study.id}`}
            className="inline-flex h-8.5 items-center rounded-md border border-line bg-panel px-3.5 text-[13px] font-semibold text-ink hover:border-ink/30 hover:bg-white"
          >
            What if…
          </Link>
          {canRun ? (
            <Link
              to={`/projects/${project.id}/studies/new?revision=${study.revisionId}&from=${study.id}`}
              className="inline-flex h-8.5 items-center rounded-md border border-line bg-panel px-3.5 text-[13px] font-semibold text-ink hover:border-ink/30 hover:bg-white"
            >
              New study from these settings
            </Link>
          ) : null}
          {canRun && rerunnable ? (
            <Button variant="primary" pending={change.isPending} onClick={() => change.mutate({ id: study.id, action: "rerun" })}>
              Run again
            </Button>
          ) : null}
        </div>
      </div>

      <ArchivedProjectNotice project={project} toDo="run, run again or cancel its studies" />
      {downloadError ? (
        <Alert className="mb-4" title="Download failed">
          {downloadError}
        </Alert>
      ) : null}
      {change.error ? (
        <Alert className="mb-4" title="That did not work">
          {change.error.message}
        </Alert>
      ) : null}

      {active ? (
        <Panel
          title="Progress"
          meta={study.status === "queued" ? "studies run one after another" : undefined}
          accent="var(--color-gyro)"
          className="mb-4"
        >
          <StudyProgress
            study={study}
            onCancel={canRun ? () => change.mutate({ id: study.id, action: "cancel" }) : undefined}
            cancelling={change.isPending}
          />
        </Panel>
      ) : null}

      {study.status === "failed" ? (
        <Alert className="mb-4" title="The run stopped with an error">
          {study.error ?? "No message was recorded."} Nothing was stored; the settings are kept, so it can be run again.
        </Alert>
      ) : null}
      {study.status === "interrupted" ? (
        <Alert tone="info" className="mb-4" title="Interrupted">
          The server stopped while this study ran, so it has no result. Run it again with the same frozen settings and seed.
        </Alert>
      ) : null}
      {study.status === "cancelled" ? (
        <Alert tone="info" className="mb-4" title="Cancelled">
          This study was cancelled before it finished; nothing was stored. Run it again to get its result.
        </Alert>
      ) : null}

      {result ? (
        <StudyResults study={study} result={result} fileBase={studyFileBase(project.name, study.number)} />
      ) : (
        <Panel title="Settings" meta="frozen when the study was queued" className="max-w-3xl">
          <RunRecord study={study} />
        </Panel>
      )}
    </>
  );
}
