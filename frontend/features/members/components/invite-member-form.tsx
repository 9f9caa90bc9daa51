import { useState } from "react";
import { zodResolver } from "@hookform/resolvers/zod";
import { useForm } from "react-hook-form";
import * as z from "zod";
import { CreateInvitationSchema, type Invitation, type Supplier } from "@shared/schemas/api";
import { RoleSchema } from "@shared/schemas/common";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { CopyButton } from "@frontend/components/ui/copy-button";
import { Field, Input, Select } from "@frontend/components/ui/field";
import { MailIcon } from "@frontend/components/ui/icons";
import { setServerErrors } from "@frontend/lib/form";
import { ROLE_DESCRIPTIONS, ROLE_LABELS } from "@frontend/lib/permissions";
import { useCreateInvitation } from "../api/create-invitation";

/** The form's values as typed; only a supplier user keeps the chosen company. */
const InviteFormSchema = z
  .object({ email: z.string(), role: RoleSchema, supplierId: z.string() })
  .transform((v): z.input<typeof CreateInvitationSchema> => ({ ...v, supplierId: v.role === "supplier" ? v.supplierId || null : null }))
  .pipe(CreateInvitationSchema);
const BLANK: z.input<typeof InviteFormSchema> = { email: "", role: "engineer", supplierId: "" };

export function InviteMemberForm({ suppliers }: { suppliers: Supplier[] }) {
  const form = useForm({ resolver: zodResolver(InviteFormSchema), defaultValues: BLANK });
  const { errors } = form.formState;
  const role = form.watch("role");
  const [sent, setSent] = useState<Invitation | null>(null);
  const create = useCreateInvitation();

  const submit = form.handleSubmit((invitation) =>
    create.mutate(invitation, {
      onSuccess: (created) => {
        setSent(created);
        form.resetField("email");
        form.resetField("supplierId");
      },
      onError: (error) => setServerErrors(form, error),
    }),
  );

  return (
    <div className="space-y-4">
      <form onSubmit={submit} noValidate aria-label="Invite a member" className="space-y-3.5">
        {errors.root?.server ? <Alert>{errors.root.server.message}</Alert> : null}
        <Field label="E-mail address" error={errors.email?.message}>
          {({ id, describedBy, invalid }) => (
            <Input
              id={id}
              type="email"
              autoComplete="off"
              placeholder="name@company.com"
              invalid={invalid}
              aria-describedby={describedBy}
              {...form.register("email")}
            />
          )}
        </Field>
        <Field label="Role" error={errors.role?.message} hint={ROLE_DESCRIPTIONS[role]}>
          {({ id, describedBy, invalid }) => (
            <Select id={id} invalid={invalid} aria-describedby={describedBy} {...form.register("role")}>
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
            error={errors.supplierId?.message}
            hint={suppliers.length === 0 ? "Add a supplier company first." : undefined}
          >
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
