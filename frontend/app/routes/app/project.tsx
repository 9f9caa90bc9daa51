import { useState, type ReactNode } from "react";
import type { QueryClient } from "@tanstack/react-query";
import { data, Link, useNavigate, useParams, type LoaderFunctionArgs } from "react-router";
import { IdSchema } from "@shared/schemas/common";
import { Button } from "@frontend/components/ui/button";
import { ChevronLeftIcon, PencilIcon, TrashIcon } from "@frontend/components/ui/icons";
import { Panel } from "@frontend/components/ui/panel";
import { useMe } from "@frontend/features/auth/api/get-me";
import { DatasetsPanel } from "@frontend/features/datasets/components/datasets-panel";
import { projectQueryOptions, useProject } from "@frontend/features/projects/api/get-project";
import { projectActivityQueryOptions } from "@frontend/features/projects/api/get-project-activity";
import { ActivityList } from "@frontend/features/projects/components/activity-list";
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
  const navigate = useNavigate();
  const [dialog, setDialog] = useState<"edit" | "delete" | null>(null);

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
            <Button icon={<PencilIcon />} onClick={() => setDialog("edit")}>
              Rename
            </Button>
            <Button variant="danger-ghost" icon={<TrashIcon />} onClick={() => setDialog("delete")}>
              Delete
            </Button>
          </div>
        ) : null}
      </div>

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
          <RevisionsPanel projectId={project.id} projectName={project.name} canWrite={can(me.role, "revisions.write")} />
          <StudiesPanel projectId={project.id} canRun={can(me.role, "studies.run")} />
          <DatasetsPanel projectId={project.id} canWrite={canWrite} />
          <ReportsPanel projectId={project.id} canWrite={can(me.role, "reports.write")} />
        </div>
        <Panel title="Activity" className="self-start" bodyClassName="max-h-[520px] overflow-y-auto">
          <ActivityList projectId={project.id} />
        </Panel>
      </div>

      {dialog === "edit" ? <EditProjectDialog project={project} open onClose={() => setDialog(null)} /> : null}
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
