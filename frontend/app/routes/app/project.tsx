import { useState, type ReactNode } from "react";
import type { QueryClient } from "@tanstack/react-query";
import { data, Link, useNavigate, useParams, type LoaderFunctionArgs } from "react-router";
import { IdSchema } from "@shared/schemas/common";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { ArchiveIcon, ChevronLeftIcon, PencilIcon, TrashIcon } from "@frontend/components/ui/icons";
import { Panel } from "@frontend/components/ui/panel";
import { useMe } from "@frontend/features/auth/api/get-me";
import { DatasetsPanel } from "@frontend/features/datasets/components/datasets-panel";
import { projectQueryOptions, useProject } from "@frontend/features/projects/api/get-project";
import { projectActivityQueryOptions } from "@frontend/features/projects/api/get-project-activity";
import { useSetProjectArchived } from "@frontend/features/projects/api/archive-project";
import { ActivityList } from "@frontend/features/projects/components/activity-list";
import { ArchiveProjectDialog } from "@frontend/features/projects/components/archive-project-dialog";
import { DeleteProjectDialog } from "@frontend/features/projects/components/delete-project-dialog";
import { EditProjectDialog } from "@frontend/features/projects/components/project-form-dialog";
import { StudyResultChip } from "@frontend/features/projects/components/study-result-chip";
import { ReportsPanel } from "@frontend/features/reports/components/reports-panel";
import { StudiesPanel } from "@frontend/features/studies/components/studies-panel";
import { RevisionsPanel } from "@frontend/features/revisions/components/revisions-panel";
import { isApiError } from "@frontend/lib/api-client";
import { formatDateTime, formatRelative } from "@frontend/lib/format";
import { can } from "@frontend/lib/permissions";
import { requirePermission } from "../../route-guards";

const notFound = () => data({ message: "This project does not exist, or it was deleted." }, { status: 404 });

export const projectLoader =
  (queryClient: QueryClient) =>
  async ({ request, params }: LoaderFunctionArgs) => {
    const id = IdSchema.safeParse(params.id);
    if (!id.success) throw notFound();
    try {
      await Promise.all([
        requirePermission(queryClient, request, "projects.read"),
        queryClient.ensureQueryData(projectQueryOptions(id.data)),
        // Not awaited for the page to show: the activity list has its own loading state.
        queryClient.prefetchQuery(projectActivityQueryOptions(id.data)),
      ]);
    } catch (error) {
      if (isApiError(error) && error.status === 404) throw notFound();
      throw error;
    }
    return null;
  };

export function ProjectRoute() {
  const { id = "" } = useParams();
  const { data: project } = useProject(id);
  const me = useMe();
  const canWrite = can(me.role, "projects.write");
  // an archived project is read-only: the server refuses every change, so nothing here offers one
  const open = project.archivedAt === null;
  const navigate = useNavigate();
  const [dialog, setDialog] = useState<"edit" | "delete" | "archive" | null>(null);
  const restore = useSetProjectArchived();

  return (
    <>
      <Link to="/projects" className="mb-3 inline-flex items-center gap-1 text-xs font-semibold text-ink/55 hover:text-ink">
        <ChevronLeftIcon size={14} /> Projects
      </Link>

      <div className="mb-5 flex flex-wrap items-start justify-between gap-4">
        <div className="min-w-0">
          <h1 className="text-[22px] leading-7 font-extrabold tracking-[-0.015em] text-ink">{project.name}</h1>
          <p className="mt-1 max-w-3xl text-[13px] whitespace-pre-line text-ink/65">
            {project.description || <span className="text-ink/40">No description.</span>}
          </p>
        </div>
        {canWrite ? (
          <div className="flex gap-2">
            {open ? (
              <>
                <Button icon={<PencilIcon />} onClick={() => setDialog("edit")}>
                  Rename
                </Button>
                <Button icon={<ArchiveIcon />} onClick={() => setDialog("archive")}>
                  Archive
                </Button>
              </>
            ) : (
              <Button
                icon={<ArchiveIcon />}
                pending={restore.isPending}
                onClick={() => restore.mutate({ id: project.id, version: project.version, archived: false })}
              >
                Restore
              </Button>
            )}
            <Button variant="danger-ghost" icon={<TrashIcon />} onClick={() => setDialog("delete")}>
              Delete
            </Button>
          </div>
        ) : null}
      </div>

      {open ? null : (
        <Alert tone="info" title={`Archived ${formatDateTime(project.archivedAt!)}: read-only`} className="mb-5">
          Its revisions, studies, data sets and reports can be opened, but nothing can be changed or added.
          {canWrite ? " Restore the project to work on it again." : null}
        </Alert>
      )}
      {restore.isError ? <Alert className="mb-5">{restore.error.message}</Alert> : null}

      <dl className="mb-5 grid grid-cols-2 gap-px overflow-hidden rounded-lg border border-line bg-line sm:grid-cols-4">
        <Fact label="Owner">{project.ownerName ?? "—"}</Fact>
        <Fact label="Created">
          <time dateTime={project.createdAt} className="tabular-nums">
            {formatDateTime(project.createdAt)}
          </time>
        </Fact>
        <Fact label="Updated">
          <time dateTime={project.updatedAt} title={formatDateTime(project.updatedAt)} className="tabular-nums">
            {formatRelative(project.updatedAt)}
          </time>
        </Fact>
        <Fact label="Last study">
          <StudyResultChip study={project.lastStudy} />
        </Fact>
      </dl>

      <div className="grid gap-5 xl:grid-cols-[minmax(0,1fr)_320px]">
        <div className="grid content-start gap-4 md:grid-cols-2">
          <RevisionsPanel projectId={project.id} projectName={project.name} canWrite={open && can(me.role, "revisions.write")} />
          <StudiesPanel projectId={project.id} canRun={open && can(me.role, "studies.run")} />
          <DatasetsPanel projectId={project.id} canWrite={open && canWrite} />
          <ReportsPanel projectId={project.id} canWrite={open && can(me.role, "reports.write")} />
        </div>
        <Panel title="Activity" className="self-start" bodyClassName="max-h-[520px] overflow-y-auto">
          <ActivityList projectId={project.id} />
        </Panel>
      </div>

      {dialog === "edit" ? <EditProjectDialog project={project} open onClose={() => setDialog(null)} /> : null}
      {dialog === "archive" ? <ArchiveProjectDialog project={project} open onClose={() => setDialog(null)} /> : null}
      {dialog === "delete" ? (
        <DeleteProjectDialog
          project={project}
          open
          onClose={() => setDialog(null)}
          onDeleted={() => navigate("/projects", { replace: true })}
        />
      ) : null}
    </>
  );
}

function Fact({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div className="bg-panel px-4 py-3">
      <dt className="text-[10px] font-bold tracking-[0.08em] text-ink/45 uppercase">{label}</dt>
      <dd className="mt-1 truncate text-[13px] font-semibold text-ink">{children}</dd>
    </div>
  );
}
