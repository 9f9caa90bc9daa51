import { useState } from "react";
import type { Invitation, Supplier } from "@shared/schemas/api";
import { Button } from "@frontend/components/ui/button";
import { ConfirmDialog } from "@frontend/components/ui/confirm-dialog";
import { CopyButton } from "@frontend/components/ui/copy-button";
import { EmptyState } from "@frontend/components/ui/empty-state";
import { MailIcon } from "@frontend/components/ui/icons";
import { RoleBadge } from "@frontend/components/ui/role-badge";
import { Table, Td, Th, THead, Tr } from "@frontend/components/ui/table";
import { formatDate } from "@frontend/lib/format";
import { useRevokeInvitation } from "../api/revoke-invitation";

export function InvitationsTable({ invitations, suppliers }: { invitations: Invitation[]; suppliers: Supplier[] }) {
  const [revoking, setRevoking] = useState<Invitation | null>(null);
  const revoke = useRevokeInvitation();
  const pending = invitations.filter((i) => i.status === "pending");
  const supplierName = (id: string | null) => (id ? (suppliers.find((s) => s.id === id)?.name ?? "—") : null);

  if (pending.length === 0) {
    return (
      <EmptyState icon={<MailIcon />} title="No open invitations" className="py-8">
        Invitations you create appear here until the person accepts them.
      </EmptyState>
    );
  }

  return (
    <>
      <Table aria-label="Pending invitations">
        <THead>
          <tr>
            <Th>Invited</Th>
            <Th>Role</Th>
            <Th align="right">Expires</Th>
            <Th align="right">
              <span className="sr-only">Actions</span>
            </Th>
          </tr>
        </THead>
        <tbody>
          {pending.map((invitation) => (
            <Tr key={invitation.id}>
              <Td className="py-2">
                <p className="font-semibold text-ink">{invitation.email}</p>
                {invitation.role === "supplier" ? <p className="text-xs text-ink/55">{supplierName(invitation.supplierId)}</p> : null}
              </Td>
              <Td>
                <RoleBadge role={invitation.role} />
              </Td>
              <Td numeric className="text-ink/65">
                {formatDate(invitation.expiresAt)}
              </Td>
              <Td>
                <div className="flex justify-end gap-1.5">
                  {invitation.link ? <CopyButton value={invitation.link} /> : null}
                  <Button size="sm" variant="danger-ghost" onClick={() => setRevoking(invitation)}>
                    Revoke
                  </Button>
                </div>
              </Td>
            </Tr>
          ))}
        </tbody>
      </Table>
      {revoking ? (
        <ConfirmDialog
          open
          onClose={() => {
            revoke.reset();
            setRevoking(null);
          }}
          title="Revoke this invitation?"
          confirmLabel="Revoke invitation"
          pending={revoke.isPending}
          error={revoke.error?.message}
          onConfirm={() => revoke.mutate(revoking.id, { onSuccess: () => setRevoking(null) })}
        >
          <p>
            The link sent to <strong className="font-bold text-ink">{revoking.email}</strong> stops working at once.
          </p>
        </ConfirmDialog>
      ) : null}
    </>
  );
}
