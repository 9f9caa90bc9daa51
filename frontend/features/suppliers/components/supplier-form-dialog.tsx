import { zodResolver } from "@hookform/resolvers/zod";
import { useForm } from "react-hook-form";
import { CreateSupplierSchema, SupplierKindSchema, type Supplier } from "@shared/schemas/api";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { Dialog } from "@frontend/components/ui/dialog";
import { Field, Input, Select } from "@frontend/components/ui/field";
import { setServerErrors } from "@frontend/lib/form";
import { useCreateSupplier } from "../api/create-supplier";
import { useUpdateSupplier } from "../api/update-supplier";
import { KIND_LABELS } from "./supplier-kind";

/** Add a supplier company, or edit one when `supplier` is given. */
export function SupplierFormDialog({ supplier, onClose }: { supplier?: Supplier; onClose: () => void }) {
  // a new company and an edited one obey the same rules; an edit sends both fields
  const form = useForm({
    resolver: zodResolver(CreateSupplierSchema),
    defaultValues: { name: supplier?.name ?? "", kind: SupplierKindSchema.catch("other").parse(supplier?.kind ?? "assembly") },
  });
  const { errors } = form.formState;
  const create = useCreateSupplier();
  const update = useUpdateSupplier();
  const pending = create.isPending || update.isPending;

  const submit = form.handleSubmit((values) => {
    const onError = (error: unknown) => setServerErrors(form, error);
    if (supplier) update.mutate({ id: supplier.id, version: supplier.version, changes: values }, { onSuccess: onClose, onError });
    else create.mutate(values, { onSuccess: onClose, onError });
  });

  return (
    <Dialog
      open
      onClose={onClose}
      busy={pending}
      size="sm"
      title={supplier ? "Edit supplier company" : "Add a supplier company"}
      description={supplier ? undefined : "Tolerance sources are owned by supplier companies; each gets its own tolerance report."}
      onSubmit={submit}
      formLabel={supplier ? "Edit supplier company" : "Add a supplier company"}
      footer={
        <>
          <Button variant="secondary" onClick={onClose} disabled={pending}>
            Cancel
          </Button>
          <Button type="submit" variant="primary" pending={pending}>
            {supplier ? "Save changes" : "Add company"}
          </Button>
        </>
      }
    >
      <div className="space-y-4">
        {errors.root?.server ? <Alert>{errors.root.server.message}</Alert> : null}
        <Field label="Company name" error={errors.name?.message}>
          {({ id, describedBy, invalid }) => (
            <Input id={id} autoComplete="organization" invalid={invalid} aria-describedby={describedBy} {...form.register("name")} />
          )}
        </Field>
        <Field label="What they supply" error={errors.kind?.message}>
          {({ id, describedBy, invalid }) => (
            <Select id={id} invalid={invalid} aria-describedby={describedBy} {...form.register("kind")}>
              {SupplierKindSchema.options.map((k) => (
                <option key={k} value={k}>
                  {KIND_LABELS[k]}
                </option>
              ))}
            </Select>
          )}
        </Field>
      </div>
    </Dialog>
  );
}
