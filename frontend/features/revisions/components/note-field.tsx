import type { ReactNode } from "react";
import type { UseFormRegisterReturn } from "react-hook-form";
import { Field, Textarea } from "@frontend/components/ui/field";

/**
 * The written words beside a revision's life: the draft's "what changed and why" (note and submit dialogs) and the
 * reviewer's reason or comment (review panel), and the same of a supplier report's review. One labelled text box,
 * registered with the dialog's form.
 */
export function NoteField({
  label,
  aside,
  hint,
  error,
  rows,
  maxLength,
  placeholder,
  field,
}: {
  label: string;
  aside?: ReactNode;
  hint?: ReactNode;
  error?: string;
  rows: number;
  maxLength?: number;
  placeholder?: string;
  field: UseFormRegisterReturn;
}) {
  return (
    <Field label={label} aside={aside} hint={hint} error={error}>
      {({ id, describedBy, invalid }) => (
        <Textarea
          id={id}
          aria-describedby={describedBy}
          invalid={invalid}
          rows={rows}
          maxLength={maxLength}
          placeholder={placeholder}
          {...field}
        />
      )}
    </Field>
  );
}
