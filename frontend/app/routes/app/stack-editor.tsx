import type { QueryClient } from "@tanstack/react-query";
import { data, useParams, type LoaderFunctionArgs } from "react-router";
import { IdSchema } from "@shared/schemas/common";
import { useMe } from "@frontend/features/auth/api/get-me";
import { projectQueryOptions, useProject } from "@frontend/features/projects/api/get-project";
import { revisionQueryOptions, useRevision } from "@frontend/features/revisions/api/get-revision";
import { StackEditor } from "@frontend/features/stack-editor/components/stack-editor";
import { suppliersQueryOptions } from "@frontend/features/suppliers/api/get-suppliers";
import { isApiError } from "@frontend/lib/api-client";
import { requirePermission } from "../../route-guards";

const notFound = () => data({ message: "This stack revision does not exist, or its project was deleted." }, { status: 404 });

export const stackEditorLoader =
  (queryClient: QueryClient) =>
  async ({ request, params }: LoaderFunctionArgs) => {
    const projectId = IdSchema.safeParse(params.id);
    const revisionId = IdSchema.safeParse(params.revisionId);
    if (!projectId.success || !revisionId.success) throw notFound();
    try {
      const [, , revision] = await Promise.all([
        requirePermission(queryClient, request, "projects.read"),
        queryClient.ensureQueryData(projectQueryOptions(projectId.data)),
        queryClient.ensureQueryData(revisionQueryOptions(revisionId.data)),
        // Owners are picked from the supplier companies; the editor works without them.
        queryClient.prefetchQuery(suppliersQueryOptions()),
      ]);
      if (revision.projectId !== projectId.data) throw notFound();
    } catch (error) {
      if (isApiError(error) && error.status === 404) throw notFound();
      throw error;
    }
    return null;
  };

export function StackEditorRoute() {
  const { id = "", revisionId = "" } = useParams();
  const { data: project } = useProject(id);
  const { data: revision } = useRevision(revisionId);
  const me = useMe();
  // A new revision is a new document: a fresh editor and history.
  return <StackEditor key={revision.id} revision={revision} project={project} me={me} />;
}
