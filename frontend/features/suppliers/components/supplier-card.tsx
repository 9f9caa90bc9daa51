import { useState } from "react";
import { zodResolver } from "@hookform/resolvers/zod";
import { useForm } from "react-hook-form";
import { CreateContactSchema, type Supplier } from "@shared/schemas/api";
import { Badge } from "@frontend/components/ui/badge";
import { Button, IconButton } from "@frontend/components/ui/button";
import { ConfirmDialog } from "@frontend/components/ui/confirm-dialog";
import { Input } from "@frontend/components/ui/field";
import { CloseIcon, MailIcon, PencilIcon, PlusIcon, TrashIcon } from "@frontend/components/ui/icons";
import { initials } from "@frontend/lib/format";
import { sentence, setServerErrors } from "@frontend/lib/form";
import { useCreateContact } from "../api/create-contact";
import { useDeleteContact } from "../api/delete-contact";
import { useDeleteSupplier } from "../api/delete-supplier";
import { SupplierFormDialog } from "./supplier-form-dialog";
import { KIND_LABELS, KIND_TONES } from "./supplier-kind";

type Confirming = { kind: "supplier" } | { kind: "contact"; contactId: string; name: string } | null;

export function SupplierCard({ supplier, canManage }: { supplier: Supplier; canManage: boolean }) {
  const [editing, setEditing] = useState(false);
  const [adding, setAdding] = useState(false);
  const [confirming, setConfirming] = useState<Confirming>(null);
  const removeSupplier = useDeleteSupplier();
  const removeContact = useDeleteContact();

  return (
    <article
      aria-label={supplier.name}
      className="flex flex-col rounded-lg border border-line bg-panel shadow-[0_1px_2px_rgba(23,33,43,0.04)]"
    >
      <header className="flex items-start justify-between gap-3 border-b border-line px-4 py-3">
        <div className="min-w-0">
          <h2 className="truncate text-[14px] font-extrabold text-ink">{supplier.name}</h2>
          <div className="mt-1 flex items-center gap-2">
            <Badge tone={KIND_TONES[supplier.kind] ?? "neutral"}>{KIND_LABELS[supplier.kind] ?? supplier.kind}</Badge>
            <span className="text-xs text-ink/50 tabular-nums">
              {supplier.contacts.length} {supplier.contacts.length === 1 ? "contact" : "contacts"}
            </span>
          </div>
        </div>
        {canManage ? (
          <div className="flex gap-0.5">
            <IconButton label={`Edit ${supplier.name}`} onClick={() => setEditing(true)}>
              <PencilIcon />
            </IconButton>
            <IconButton label={`Delete ${supplier.name}`} variant="danger-ghost" onClick={() => setConfirming({ kind: "supplier" })}>
              <TrashIcon />
            </IconButton>
          </div>
        ) : null}
      </header>

      <ul className="flex-1 divide-y divide-line/70" aria-label={`Contacts at ${supplier.name}`}>
        {supplier.contacts.length === 0 ? (
          <li className="px-4 py-3 text-xs text-ink/50">No contacts yet. Reports are sent to a company's contacts.</li>
        ) : (
          supplier.contacts.map((contact) => (
            <li key={contact.id} className="group flex items-center gap-2.5 px-4 py-2">
              <span className="flex size-6 shrink-0 items-center justify-center rounded-full bg-ink/[0.07] text-[9px] font-extrabold text-ink/70">
                {initials(contact.name)}
              </span>
              <div className="min-w-0 flex-1">
                <p className="truncate text-[13px] font-semibold text-ink">{contact.name}</p>
                <a href={`mailto:${contact.email}`} className="block truncate text-xs text-ink/55 hover:text-gyro hover:underline">
                  {contact.email}
                </a>
              </div>
              <span
                className={
                  contact.hasAccount
                    ? "shrink-0 rounded-full bg-pass/10 px-2 py-0.5 text-[11px] font-semibold text-pass"
                    : "shrink-0 text-[11px] text-ink/45"
                }
                title={contact.hasAccount ? "Signs in to Orthostack as a supplier user" : "Receives reports by mail; no account"}
              >
                {contact.hasAccount ? "has an account" : "mail only"}
              </span>
              {canManage ? (
                <IconButton
                  label={`Remove ${contact.name}`}
                  variant="danger-ghost"
                  className="opacity-60 group-hover:opacity-100 focus:opacity-100"
                  onClick={() => setConfirming({ kind: "contact", contactId: contact.id, name: contact.name })}
                >
                  <CloseIcon />
                </IconButton>
              ) : null}
            </li>
          ))
        )}
      </ul>

      {canManage ? (
        <footer className="border-t border-line px-4 py-2.5">
          {adding ? (
            <AddContactForm supplierId={supplier.id} onDone={() => setAdding(false)} />
          ) : (
            <Button size="sm" variant="ghost" icon={<PlusIcon />} onClick={() => setAdding(true)} className="-ml-2">
              Add contact
            </Button>
          )}
        </footer>
      ) : null}

      {editing ? <SupplierFormDialog supplier={supplier} onClose={() => setEditing(false)} /> : null}
      {confirming?.kind === "supplier" ? (
        <ConfirmDialog
          open
          onClose={() => {
            removeSupplier.reset();
            setConfirming(null);
          }}
          title="Delete this supplier company?"
          confirmLabel="Delete company"
          pending={removeSupplier.isPending}
          error={removeSupplier.error?.message}
          onConfirm={() => removeSupplier.mutate({ id: supplier.id, version: supplier.version }, { onSuccess: () => setConfirming(null) })}
        >
          <p>
            <strong className="font-bold text-ink">{supplier.name}</strong> and its {supplier.contacts.length} contact
            {supplier.contacts.length === 1 ? "" : "s"} will be removed. Tolerance sources it owns will have no owner.
          </p>
        </ConfirmDialog>
      ) : null}
      {confirming?.kind === "contact" ? (
        <ConfirmDialog
          open
          onClose={() => {
            removeContact.reset();
            setConfirming(null);
          }}
          title="Remove this contact?"
          confirmLabel="Remove contact"
          pending={removeContact.isPending}
          error={removeContact.error?.message}
          onConfirm={() =>
            removeContact.mutate(
              { supplierId: supplier.id, contactId: confirming.contactId, version: supplier.version },
              { onSuccess: () => setConfirming(null) },
            )
          }
        >
          <p>
            <strong className="font-bold text-ink">{confirming.name}</strong> will no longer receive reports for {supplier.name}.
          </p>
        </ConfirmDialog>
      ) : null}
    </article>
  );
}

function AddContactForm({ supplierId, onDone }: { supplierId: string; onDone: () => void }) {
  const form = useForm({ resolver: zodResolver(CreateContactSchema), defaultValues: { name: "", email: "" } });
  const { errors } = form.formState;
  const create = useCreateContact();

  const submit = form.handleSubmit((contact) =>
    create.mutate({ supplierId, contact }, { onSuccess: onDone, onError: (error) => setServerErrors(form, error) }),
  );

  const first = errors.name?.message ?? errors.email?.message ?? errors.root?.server?.message;
  const message = first ? sentence(first) : undefined;
  return (
    <form onSubmit={submit} noValidate aria-label="Add contact" className="space-y-2">
      <div className="grid grid-cols-2 gap-2">
        <Input aria-label="Contact name" placeholder="Name" autoFocus invalid={!!errors.name} compact {...form.register("name")} />
        <Input
          aria-label="Contact e-mail"
          type="email"
          placeholder="name@supplier.com"
          invalid={!!errors.email}
          compact
          {...form.register("email")}
        />
      </div>
      {message ? (
        <p role="alert" className="text-xs font-medium text-fail">
          {message}
        </p>
      ) : null}
      <div className="flex justify-end gap-1.5">
        <Button size="sm" variant="ghost" onClick={onDone} disabled={create.isPending}>
          Cancel
        </Button>
        <Button size="sm" type="submit" variant="primary" pending={create.isPending} icon={<MailIcon />}>
          Add contact
        </Button>
      </div>
    </form>
  );
}
