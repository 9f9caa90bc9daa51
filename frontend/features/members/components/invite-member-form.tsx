import { useState, type FormEvent } from "react";
import { CreateInvitationSchema, type Invitation, type Supplier } from "@shared/schemas/api";
import { RoleSchema, type Role } from "@shared/schemas/common";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { CopyButton } from "@frontend/components/ui/copy-button";
import { Field, Input, Select } from "@frontend/components/ui/field";
import { MailIcon } from "@frontend/components/ui/icons";
import { parseForm, serverFieldErrors, type FieldErrors } from "@frontend/lib/form";
import { ROLE_DESCRIPTIONS, ROLE_LABELS } from "@frontend/lib/permissions";
import { useCreateInvitation } from "../api/create-invitation";

export function InviteMemberForm({ suppliers }: { suppliers: Supplier[] }) {
  const [email, setEmail] = useState("");
  const [role, setRole] = useState<Role>("engineer");
  const [supplierId, setSupplierId] = useState("");
  const [errors, setErrors] = useState<FieldErrors>({});
  const [sent, setSent] = useState<Invitation | null>(null);
  const create = useCreateInvitation();

  function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const values = { email, role, supplierId: role === "supplier" ? supplierId || null : null };
    const parsed = parseForm(CreateInvitationSchema, values);
    if (!parsed.ok) return setErrors(parsed.errors);
    setErrors({});
    create.mutate(parsed.data, {
      onSuccess: (invitation) => {
        setSent(invitation);
        setEmail("");
        setSupplierId("");
      },
      onError: (error) => setErrors(serverFieldErrors(error)),
    });
  }

  return (
    <div className="space-y-4">
      <form onSubmit={submit} noValidate aria-label="Invite a member" className="space-y-3.5">
        {errors._form ? <Alert>{errors._form}</Alert> : null}
        <Field label="E-mail address" error={errors.email}>
          {({ id, describedBy, invalid }) => (
            <Input
              id={id}
              name="email"
              type="email"
              autoComplete="off"
              placeholder="name@company.com"
              value={email}
              invalid={invalid}
              aria-describedby={describedBy}
              onChange={(e) => setEmail(e.target.value)}
            />
          )}
        </Field>
        <Field label="Role" error={errors.role} hint={ROLE_DESCRIPTIONS[role]}>
          {({ id, describedBy, invalid }) => (
            <Select
              id={id}
              name="role"
              value={role}
              invalid={invalid}
              aria-describedby={describedBy}
              onChange={(e) => setRole(RoleSchema.parse(e.target.value))}
            >
              {RoleSchema.options.map((r) => (
                <option key={r} value={r}>
                  {ROLE_LABELS[r]}
                </option>
              ))}
            </Select>
          )}
        </Field>
        {role === "supplier" ? (
          <Field
            label="Supplier company"
            error={errors.supplierId}
            hint={suppliers.length === 0 ? "Add a supplier company first." : undefined}
          >
            {({ id, describedBy, invalid }) => (
              <Select
                id={id}
                name="supplierId"
                value={supplierId}
                invalid={invalid}
                aria-describedby={describedBy}
                onChange={(e) => setSupplierId(e.target.value)}
              >
                <option value="">Choose…</option>
                {suppliers.map((s) => (
                  <option key={s.id} value={s.id}>
                    {s.name}
                  </option>
                ))}
              </Select>
            )}
          </Field>
        ) : null}
        <Button type="submit" variant="primary" pending={create.isPending} icon={<MailIcon />} className="w-full">
          Create invitation
        </Button>
      </form>
      {sent ? (
        <div className="rounded-md border border-pass/25 bg-pass/[0.05] p-3" role="status" aria-label="Invitation created">
          <p className="text-[13px] font-bold text-pass">Invitation ready for {sent.email}</p>
          <p className="mt-0.5 text-xs text-ink/65">
            {sent.mailed
              ? "The link below went out by e-mail; you can also pass it on yourself."
              : "The e-mail could not be sent. Send this link yourself."}{" "}
            It works once and expires on{" "}
            {new Date(sent.expiresAt).toLocaleDateString("en-GB", { day: "2-digit", month: "short", year: "numeric" })}.
          </p>
          {sent.link ? (
            <div className="mt-2 flex items-center gap-2">
              <input
                readOnly
                aria-label="Invitation link"
                value={sent.link}
                onFocus={(e) => e.currentTarget.select()}
                className="h-7 min-w-0 flex-1 rounded border border-line bg-white px-2 font-mono text-[11px] text-ink/80"
              />
              <CopyButton value={sent.link} />
            </div>
          ) : null}
        </div>
      ) : null}
    </div>
  );
}
