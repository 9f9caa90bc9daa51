import { useState } from "react";
import { Link } from "react-router";
import type { Project } from "@shared/schemas/api";
import { IconButton } from "@frontend/components/ui/button";
import { PencilIcon, TrashIcon } from "@frontend/components/ui/icons";
import { Table, TableFrame, Td, Th, THead, Tr } from "@frontend/components/ui/table";
import { formatDateTime, formatRelative } from "@frontend/lib/format";
import { DeleteProjectDialog } from "./delete-project-dialog";
import { EditProjectDialog } from "./project-form-dialog";
import { StudyResultChip } from "./study-result-chip";

type Pending = { kind: "edit" | "delete"; project: Project } | null;

export function ProjectsTable({ projects, canWrite }: { projects: Project[]; canWrite: boolean }) {
  const [pending, setPending] = useState<Pending>(null);

  return (
    <>
      <TableFrame>
        <Table aria-label="Projects">
          <THead>
            <tr>
              <Th className="w-[46%]">Project</Th>
              <Th>Owner</Th>
              <Th align="right">Updated</Th>
              <Th>Last study</Th>
              {canWrite ? (
                <Th className="w-20">
                  <span className="sr-only">Actions</span>
                </Th>
              ) : null}
            </tr>
          </THead>
          <tbody>
            {projects.map((project) => (
              <Tr key={project.id} className="group">
                <Td className="py-2">
                  <Link to={`/projects/${project.id}`} className="font-bold text-ink decoration-ink/30 underline-offset-2 hover:underline">
                    {project.name}
                  </Link>
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
                {canWrite ? (
                  <Td className="text-right">
                    <div className="flex justify-end gap-0.5 opacity-70 transition-opacity group-hover:opacity-100 focus-within:opacity-100">
                      <IconButton label={`Rename ${project.name}`} onClick={() => setPending({ kind: "edit", project })}>
                        <PencilIcon />
                      </IconButton>
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
            ))}
          </tbody>
        </Table>
      </TableFrame>
      {pending?.kind === "edit" ? (
        <EditProjectDialog key={pending.project.id} project={pending.project} open onClose={() => setPending(null)} />
      ) : null}
      {pending?.kind === "delete" ? (
        <DeleteProjectDialog key={pending.project.id} project={pending.project} open onClose={() => setPending(null)} />
      ) : null}
    </>
  );
}
