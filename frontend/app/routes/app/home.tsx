import type { QueryClient } from "@tanstack/react-query";
import { redirect, type LoaderFunctionArgs } from "react-router";
import { homePath } from "@frontend/lib/permissions";
import { requireMe } from "../../route-guards";

/** `/` has no page of its own: each role starts where its work is. */
export const homeLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    const me = await requireMe(queryClient, request);
    return redirect(homePath(me.role));
  };
