import type { QueryClient } from "@tanstack/react-query";
import type { LoaderFunctionArgs } from "react-router";
import { Alert } from "@frontend/components/ui/alert";
import { PageHeader } from "@frontend/components/ui/page-header";
import { Panel } from "@frontend/components/ui/panel";
import { useMe } from "@frontend/features/auth/api/get-me";
import { invitationsQueryOptions, useInvitations } from "@frontend/features/members/api/get-invitations";
import { membersQueryOptions, useMembers } from "@frontend/features/members/api/get-members";
import { InvitationsTable } from "@frontend/features/members/components/invitations-table";
import { InviteMemberForm } from "@frontend/features/members/components/invite-member-form";
import { MembersTable } from "@frontend/features/members/components/members-table";
import { suppliersQueryOptions, useSuppliers } from "@frontend/features/suppliers/api/get-suppliers";
import { requirePermission } from "../../route-guards";

export const membersLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, "members.manage");
    await Promise.all([
      queryClient.ensureQueryData(membersQueryOptions()),
      queryClient.ensureQueryData(invitationsQueryOptions()),
      queryClient.ensureQueryData(suppliersQueryOptions()),
    ]);
    return null;
  };

export function MembersRoute() {
  const me = useMe();
  const members = useMembers();
  const invitations = useInvitations();
  const suppliers = useSuppliers();
  const supplierList = suppliers.data ?? [];
  const pendingCount = (invitations.data ?? []).filter((i) => i.status === "pending").length;

  return (
    <>
      <PageHeader
        title="Members"
        description="Who can sign in to this workspace and what their role lets them do. Supplier users see only the reports released to their company."
      />
      <div className="grid gap-5 xl:grid-cols-[minmax(0,1fr)_340px]">
        <div className="min-w-0 space-y-5">
          <section aria-labelledby="members-heading">
            <div className="mb-2 flex items-baseline gap-2">
              <h2 id="members-heading" className="text-[13px] font-bold text-ink">
                Members
              </h2>
              <span className="text-xs text-ink/50 tabular-nums">{members.data?.length ?? ""}</span>
            </div>
            {members.isError ? (
              <Alert>{members.error.message}</Alert>
            ) : (
              <MembersTable members={members.data ?? []} suppliers={supplierList} currentUserId={me.user.id} />
            )}
          </section>
          <Panel title="Pending invitations" meta={<span className="tabular-nums">{pendingCount}</span>} padded={false}>
            {invitations.isError ? (
              <div className="p-4">
                <Alert>{invitations.error.message}</Alert>
              </div>
            ) : (
              <InvitationsTable invitations={invitations.data ?? []} suppliers={supplierList} />
            )}
          </Panel>
        </div>
        <Panel title="Invite a person" className="self-start">
          <InviteMemberForm suppliers={supplierList} />
        </Panel>
      </div>
    </>
  );
}
