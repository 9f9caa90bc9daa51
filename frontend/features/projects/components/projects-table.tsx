import { useState } from "react";
import { Link } from "react-router";
import type { Project } from "@shared/schemas/api";
import type { ProjectAwaiting } from "@shared/schemas/review-queue";
import { Badge } from "@frontend/components/ui/badge";
import { IconButton } from "@frontend/components/ui/button";
import { ArchiveIcon, PencilIcon, TrashIcon } from "@frontend/components/ui/icons";
import { Table, TableFrame, Td, Th, THead, Tr } from "@frontend/components/ui/table";
import { formatDate, formatDateTime, formatRelative } from "@frontend/lib/format";
import { useSetProjectArchived } from "../api/archive-project";
import { ArchiveProjectDialog } from "./archive-project-dialog";
import { DeleteProjectDialog } from "./delete-project-dialog";
import { EditProjectDialog } from "./project-form-dialog";
import { StudyResultChip } from "./study-result-chip";

type Pending = { kind: "edit" | "delete" | "archive"; project: Project } | null;

const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;

/** "2 revisions, 1 report" waiting for a reviewer in this project, or nothing. */
export function awaitingWords(a: ProjectAwaiting | undefined): string {
  if (!a) return "";
  return [a.revisions ? plural(a.revisions, "revision", "revisions") : "", a.reports ? plural(a.reports, "report", "reports") : ""]
    .filter(Boolean)
    .join(", ");
}

export function ProjectsTable({
  projects,
  canWrite,
  awaiting = {},
}: {
  projects: Project[];
  canWrite: boolean;
  /** per project id, what waits for review there (GET /api/review-queue) */
  awaiting?: Partial<Record<string, ProjectAwaiting>>;
}) {
  const [pending, setPending] = useState<Pending>(null);
  const restore = useSetProjectArchived();

  return (
    <>
      {restore.isError ? (
        <p role="alert" className="mb-2 text-xs font-medium text-fail">
          {restore.error.message}
        </p>
      ) : null}
      <TableFrame>
        <Table aria-label="Projects">
          <THead>
            <tr>
              <Th className="w-[40%]">Project</Th>
              <Th>Owner</Th>
              <Th align="right">Updated</Th>
              <Th>Last study</Th>
              <Th>Awaiting review</Th>
              {canWrite ? (
                <Th className="w-24">
                  <span className="sr-only">Actions</span>
                </Th>
              ) : null}
            </tr>
          </THead>
          <tbody>
            {projects.map((project) => {
              const waiting = awaitingWords(awaiting[project.id]);
              return (
                <Tr key={project.id} className="group">
                  <Td className="py-2">
                    <Link
                      to={`/projects/${project.id}`}
                      className="font-bold text-ink decoration-ink/30 underline-offset-2 hover:underline"
                    >
                      {project.name}
                    </Link>
                    {project.archivedAt ? (
                      <Badge className="ml-2" tone="neutral">
                        <span title={`Archived ${formatDateTime(project.archivedAt)}`}>Archived {formatDate(project.archivedAt)}</span>
                      </Badge>
                    ) : null}
                    {project.description ? <p className="mt-0.5 max-w-xl text-xs text-ink/55">{project.description}</p> : null}
                  </Td>
                  <Td className="whitespace-nowrap text-ink/80">{project.ownerName ?? <span className="text-ink/40">—</span>}</Td>
                  <Td numeric className="text-ink/70">
                    <time dateTime={project.updatedAt} title={formatDateTime(project.updatedAt)}>
                      {formatRelative(project.updatedAt)}
                    </time>
                  </Td>
                  <Td>
                    <StudyResultChip study={project.lastStudy} />
                  </Td>
                  <Td className="whitespace-nowrap">
                    {waiting ? (
                      <Badge tone="mag" dot>
                        {waiting}
                      </Badge>
                    ) : (
                      <span className="text-ink/40">—</span>
                    )}
                  </Td>
                  {canWrite ? (
                    <Td className="text-right">
                      <div className="flex justify-end gap-0.5 opacity-70 transition-opacity group-hover:opacity-100 focus-within:opacity-100">
                        {project.archivedAt ? (
                          <IconButton
                            label={`Restore ${project.name}`}
                            disabled={restore.isPending}
                            onClick={() => restore.mutate({ id: project.id, version: project.version, archived: false })}
                          >
                            <ArchiveIcon />
                          </IconButton>
                        ) : (
                          <>
                            <IconButton label={`Rename ${project.name}`} onClick={() => setPending({ kind: "edit", project })}>
                              <PencilIcon />
                            </IconButton>
                            <IconButton label={`Archive ${project.name}`} onClick={() => setPending({ kind: "archive", project })}>
                              <ArchiveIcon />
                            </IconButton>
                          </>
                        )}
                        <IconButton
                          label={`Delete ${project.name}`}
                          variant="danger-ghost"
                          onClick={() => setPending({ kind: "delete", project })}
                        >
                          <TrashIcon />
                        </IconButton>
                      </div>
                    </Td>
                  ) : null}
                </Tr>
              );
            })}
          </tbody>
        </Table>
      </TableFrame>
      {pending?.kind === "edit" ? (
        <EditProjectDialog key={pending.project.id} project={pending.project} open onClose={() => setPending(null)} />
      ) : null}
      {pending?.kind === "archive" ? (
        <ArchiveProjectDialog key={pending.project.id} project={pending.project} open onClose={() => setPending(null)} />
      ) : null}
      {pending?.kind === "delete" ? (
        <DeleteProjectDialog key={pending.project.id} project={pending.project} open onClose={() => setPending(null)} />
      ) : null}
    </>
  );
}
