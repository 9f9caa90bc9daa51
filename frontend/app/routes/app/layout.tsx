import type { QueryClient } from "@tanstack/react-query";
import { Outlet, type LoaderFunctionArgs } from "react-router";
import { useMe } from "@frontend/features/auth/api/get-me";
import { useReviewQueue } from "@frontend/features/review-queue";
import { can } from "@frontend/lib/permissions";
import { requireMe } from "../../route-guards";
import { SideNav } from "../../shell/side-nav";
import { TopBar } from "../../shell/top-bar";

export const appLayoutLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requireMe(queryClient, request);
    return null;
  };

export function AppLayout() {
  const me = useMe();
  const queue = useReviewQueue(can(me.role, "reviews.read"));
  return (
    <div className="flex h-dvh overflow-hidden">
      <SideNav role={me.role} counts={{ "/": queue.data?.items.length }} />
      <div className="flex min-w-0 flex-1 flex-col">
        <TopBar me={me} />
        <main className="min-h-0 flex-1 overflow-y-auto" id="main">
          <div className="mx-auto w-full max-w-[1280px] px-6 py-6">
            <Outlet />
          </div>
        </main>
      </div>
    </div>
  );
}
