import { useState } from "react";
import { zodResolver } from "@hookform/resolvers/zod";
import { useForm } from "react-hook-form";
import * as z from "zod";
import { UpdateMemberSchema, type Member, type Supplier } from "@shared/schemas/api";
import { RoleSchema, type Role } from "@shared/schemas/common";
import { Alert } from "@frontend/components/ui/alert";
import { Button, IconButton } from "@frontend/components/ui/button";
import { ConfirmDialog } from "@frontend/components/ui/confirm-dialog";
import { Dialog } from "@frontend/components/ui/dialog";
import { Field, Select } from "@frontend/components/ui/field";
import { TrashIcon } from "@frontend/components/ui/icons";
import { RoleBadge } from "@frontend/components/ui/role-badge";
import { Table, TableFrame, Td, Th, THead, Tr } from "@frontend/components/ui/table";
import { formatDate, formatDateTime, initials } from "@frontend/lib/format";
import { setServerErrors } from "@frontend/lib/form";
import { ROLE_LABELS } from "@frontend/lib/permissions";
import { useDeleteMember } from "../api/delete-member";
import { useUpdateMember } from "../api/update-member";
import { useSendResetLink } from "../api/send-reset-link";

type Props = { members: Member[]; suppliers: Supplier[]; currentUserId: string };

export function MembersTable({ members, suppliers, currentUserId }: Props) {
  const update = useUpdateMember();
  const [supplierFor, setSupplierFor] = useState<Member | null>(null);
  const [removing, setRemoving] = useState<Member | null>(null);
  const [resetting, setResetting] = useState<Member | null>(null);
  const [rowNote, setRowNote] = useState<{ id: string; message: string } | null>(null);
  const [rowError, setRowError] = useState<{ id: string; message: string } | null>(null);

  function changeRole(member: Member, role: Role) {
    if (role === member.role) return;
    // A supplier user must belong to a supplier company; ask which before saving.
    if (role === "supplier") return setSupplierFor(member);
    setRowError(null);
    update.mutate(
      { id: member.id, changes: { role, supplierId: null } },
      { onError: (error) => setRowError({ id: member.id, message: error.message }) },
    );
  }

  return (
    <>
      <TableFrame>
        <Table aria-label="Members">
          <THead>
            <tr>
              <Th>Member</Th>
              <Th className="w-44">Role</Th>
              <Th>Supplier company</Th>
              <Th align="right">Joined</Th>
              <Th className="w-52">
                <span className="sr-only">Actions</span>
              </Th>
            </tr>
          </THead>
          <tbody>
            {members.map((member) => {
              const self = member.userId === currentUserId;
              const saving = update.isPending && update.variables?.id === member.id;
              return (
                <Tr key={member.id}>
                  <Td className="py-2">
                    <div className="flex items-center gap-2.5">
                      <span className="flex size-7 shrink-0 items-center justify-center rounded-full bg-ink/[0.07] text-[10px] font-extrabold text-ink/70">
                        {initials(member.name)}
                      </span>
                      <div className="min-w-0">
                        <p className="font-bold text-ink">
                          {member.name}
                          {self ? <span className="ml-1.5 text-xs font-semibold text-ink/45">(you)</span> : null}
                        </p>
                        <p className="text-xs text-ink/55">{member.email}</p>
                      </div>
                    </div>
                    {rowError?.id === member.id ? <p className="mt-1 text-xs font-medium text-fail">{rowError.message}</p> : null}
                    {rowNote?.id === member.id ? <p className="mt-1 text-xs font-medium text-pass">{rowNote.message}</p> : null}
                  </Td>
                  <Td>
                    {self ? (
                      <RoleBadge role={member.role} />
                    ) : (
                      <Select
                        aria-label={`Role of ${member.name}`}
                        value={member.role}
                        disabled={saving}
                        compact
                        className="w-36 font-semibold"
                        onChange={(e) => changeRole(member, RoleSchema.parse(e.target.value))}
                      >
                        {RoleSchema.options.map((role) => (
                          <option key={role} value={role}>
                            {ROLE_LABELS[role]}
                          </option>
                        ))}
                      </Select>
                    )}
                  </Td>
                  <Td className="text-ink/75">{member.supplierName ?? <span className="text-ink/35">—</span>}</Td>
                  <Td numeric className="text-ink/65">
                    {formatDate(member.createdAt)}
                  </Td>
                  <Td className="text-right">
                    {self ? null : (
                      <div className="flex items-center justify-end gap-1">
                        <Button size="sm" variant="ghost" onClick={() => setResetting(member)}>
                          Send reset link
                        </Button>
                        <IconButton label={`Remove ${member.name}`} variant="danger-ghost" onClick={() => setRemoving(member)}>
                          <TrashIcon />
                        </IconButton>
                      </div>
                    )}
                  </Td>
                </Tr>
              );
            })}
          </tbody>
        </Table>
      </TableFrame>
      {supplierFor ? (
        <SupplierRoleDialog key={supplierFor.id} member={supplierFor} suppliers={suppliers} onClose={() => setSupplierFor(null)} />
      ) : null}
      {removing ? <RemoveMemberDialog key={removing.id} member={removing} onClose={() => setRemoving(null)} /> : null}
      {resetting ? (
        <ResetLinkDialog
          key={resetting.id}
          member={resetting}
          onClose={() => setResetting(null)}
          onSent={(message) => {
            setRowNote({ id: resetting.id, message });
            setResetting(null);
          }}
        />
      ) : null}
    </>
  );
}

/** The one choice of the dialog: a supplier user belongs to a supplier company. */
const SupplierRoleFormSchema = z
  .object({ supplierId: z.string().min(1, { message: "Choose the supplier company this person works for." }) })
  .transform((v): z.input<typeof UpdateMemberSchema> => ({ role: "supplier", supplierId: v.supplierId }))
  .pipe(UpdateMemberSchema);

function SupplierRoleDialog({ member, suppliers, onClose }: { member: Member; suppliers: Supplier[]; onClose: () => void }) {
  const form = useForm({ resolver: zodResolver(SupplierRoleFormSchema), defaultValues: { supplierId: member.supplierId ?? "" } });
  const { errors } = form.formState;
  const error = errors.supplierId?.message ?? errors.root?.server?.message;
  const update = useUpdateMember();

  const submit = form.handleSubmit((changes) =>
    update.mutate({ id: member.id, changes }, { onSuccess: onClose, onError: (e) => setServerErrors(form, e) }),
  );

  return (
    <Dialog
      open
      onClose={onClose}
      busy={update.isPending}
      size="sm"
      title={`Make ${member.name} a supplier user`}
      description="Supplier users see only the reports released to their own company, and nothing else in the workspace."
      onSubmit={submit}
      footer={
        <>
          <Button variant="secondary" onClick={onClose} disabled={update.isPending}>
            Cancel
          </Button>
          <Button type="submit" variant="primary" pending={update.isPending}>
            Change role
          </Button>
        </>
      }
    >
      {suppliers.length === 0 ? (
        <Alert tone="info">Add a supplier company on the Suppliers page first.</Alert>
      ) : (
        <Field label="Supplier company" error={error}>
          {({ id, describedBy, invalid }) => (
            <Select id={id} invalid={invalid} aria-describedby={describedBy} {...form.register("supplierId")}>
              <option value="">Choose…</option>
              {suppliers.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.name}
                </option>
              ))}
            </Select>
          )}
        </Field>
      )}
    </Dialog>
  );
}

function RemoveMemberDialog({ member, onClose }: { member: Member; onClose: () => void }) {
  const remove = useDeleteMember();
  return (
    <ConfirmDialog
      open
      onClose={onClose}
      title="Remove this member?"
      confirmLabel="Remove member"
      pending={remove.isPending}
      error={remove.error?.message}
      onConfirm={() => remove.mutate(member.id, { onSuccess: onClose })}
    >
      <p>
        <strong className="font-bold text-ink">{member.name}</strong> ({member.email}) loses access to the workspace at once. Their past
        activity stays on record. You can invite them again later.
      </p>
    </ConfirmDialog>
  );
}

function ResetLinkDialog({ member, onClose, onSent }: { member: Member; onClose: () => void; onSent: (message: string) => void }) {
  const send = useSendResetLink();
  return (
    <ConfirmDialog
      open
      onClose={onClose}
      title="Send a link to set a new password?"
      confirmLabel="Send the link"
      pending={send.isPending}
      error={send.error?.message}
      onConfirm={() =>
        send.mutate(member.id, {
          onSuccess: (sent) =>
            onSent(
              sent.mailed
                ? `Reset link sent to ${member.email}; it works once, until ${formatDateTime(sent.expiresAt)}.`
                : "The mail could not be sent; check the mail settings and try again.",
            ),
        })
      }
    >
      <p>
        <strong className="font-bold text-ink">{member.name}</strong> receives a link at {member.email} to choose a new password. Using it
        signs them out everywhere. Only they receive the link.
      </p>
    </ConfirmDialog>
  );
}
