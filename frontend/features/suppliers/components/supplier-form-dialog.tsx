import { useState, type FormEvent } from "react";
import { CreateSupplierSchema, SupplierKindSchema, UpdateSupplierSchema, type Supplier } from "@shared/schemas/api";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { Dialog } from "@frontend/components/ui/dialog";
import { Field, Input, Select } from "@frontend/components/ui/field";
import { parseForm, serverFieldErrors, type FieldErrors } from "@frontend/lib/form";
import { useCreateSupplier } from "../api/create-supplier";
import { useUpdateSupplier } from "../api/update-supplier";
import { KIND_LABELS } from "./supplier-kind";

/** Add a supplier company, or edit one when `supplier` is given. */
export function SupplierFormDialog({ supplier, onClose }: { supplier?: Supplier; onClose: () => void }) {
  const [name, setName] = useState(supplier?.name ?? "");
  const [kind, setKind] = useState(supplier?.kind ?? "assembly");
  const [errors, setErrors] = useState<FieldErrors>({});
  const create = useCreateSupplier();
  const update = useUpdateSupplier();
  const pending = create.isPending || update.isPending;

  function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const onError = (error: unknown) => setErrors(serverFieldErrors(error));
    if (supplier) {
      const parsed = parseForm(UpdateSupplierSchema, { name, kind });
      if (!parsed.ok) return setErrors(parsed.errors);
      setErrors({});
      update.mutate({ id: supplier.id, version: supplier.version, changes: parsed.data }, { onSuccess: onClose, onError });
    } else {
      const parsed = parseForm(CreateSupplierSchema, { name, kind });
      if (!parsed.ok) return setErrors(parsed.errors);
      setErrors({});
      create.mutate(parsed.data, { onSuccess: onClose, onError });
    }
  }

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
        {errors._form ? <Alert>{errors._form}</Alert> : null}
        <Field label="Company name" error={errors.name}>
          {({ id, describedBy, invalid }) => (
            <Input
              id={id}
              name="name"
              autoComplete="organization"
              value={name}
              invalid={invalid}
              aria-describedby={describedBy}
              onChange={(e) => setName(e.target.value)}
            />
          )}
        </Field>
        <Field label="What they supply" error={errors.kind}>
          {({ id, describedBy, invalid }) => (
            <Select
              id={id}
              name="kind"
              value={kind}
              invalid={invalid}
              aria-describedby={describedBy}
              onChange={(e) => setKind(e.target.value)}
            >
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
