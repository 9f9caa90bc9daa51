import type { ReactNode } from "react";
import { zodResolver } from "@hookform/resolvers/zod";
import { useForm } from "react-hook-form";
import * as z from "zod";
import { ReleaseReportSchema, UpdateReportSchema, type Report } from "@shared/schemas/reports";
import { ReturnRevisionSchema } from "@shared/schemas/revisions";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { ConfirmDialog } from "@frontend/components/ui/confirm-dialog";
import { Dialog } from "@frontend/components/ui/dialog";
import { Field, Input, Textarea } from "@frontend/components/ui/field";
import { NoteField } from "@frontend/features/revisions";
import { setServerErrors } from "@frontend/lib/form";
import { useAcknowledgeReport } from "../api/acknowledge-report";
import { useDeleteReport } from "../api/delete-report";
import { useReleaseReport } from "../api/release-report";
import { useReturnReport } from "../api/return-report";
import { useUpdateReport } from "../api/update-report";
import { readPng } from "../lib/files";
import { reportTitle } from "./report-status";

type Base = { report: Report; onClose: () => void };

// what the server reads from these dialogs: a comment, optional on release and acknowledgement, asked for when sending back
const OptionalCommentSchema = ReleaseReportSchema.required({ comment: true });

/** A dialog with a note and one action button; shared by release, send back and acknowledge. */
function NoteDialog({
  title,
  description,
  children,
  label,
  noteLabel,
  required = false,
  placeholder,
  pending,
  error,
  onClose,
  onConfirm,
}: {
  title: string;
  description: ReactNode;
  children?: ReactNode;
  label: string;
  noteLabel: string;
  /** the note must be given (sending back says why) */
  required?: boolean;
  placeholder: string;
  pending: boolean;
  error?: string;
  onClose: () => void;
  onConfirm: (note: string) => void;
}) {
  const form = useForm<{ comment: string }, unknown, { comment: string }>({
    resolver: required ? zodResolver(ReturnRevisionSchema) : zodResolver(OptionalCommentSchema),
    defaultValues: { comment: "" },
  });
  const note = form.watch("comment");
  return (
    <Dialog
      open
      onClose={onClose}
      title={title}
      description={description}
      busy={pending}
      onSubmit={form.handleSubmit(({ comment }) => onConfirm(comment))}
      formLabel={title}
      footer={
        <>
          <Button variant="secondary" onClick={onClose} disabled={pending}>
            Cancel
          </Button>
          <Button type="submit" variant="primary" pending={pending} disabled={required && note.trim() === ""}>
            {label}
          </Button>
        </>
      }
    >
      <div className="space-y-3">
        {children}
        <NoteField
          label={noteLabel}
          aside={required ? undefined : "optional"}
          error={form.formState.errors.comment?.message}
          rows={3}
          placeholder={placeholder}
          field={form.register("comment")}
        />
        {error ? <Alert>{error}</Alert> : null}
      </div>
    </Dialog>
  );
}

export function ReleaseDialog({ report, onClose }: Base) {
  const release = useReleaseReport();
  return (
    <NoteDialog
      title={`Release ${reportTitle(report)}?`}
      description={
        <>
          Its PDF, spreadsheet and CSV are made once now and kept exactly as they will be sent, each with a SHA-256 checksum. The report is
          then frozen: a change makes revision {report.revision + 1}.
        </>
      }
      label="Release report"
      noteLabel="Review note"
      placeholder="What you checked, for the record."
      pending={release.isPending}
      error={release.error?.message}
      onClose={onClose}
      onConfirm={(comment) =>
        release.mutate({ id: report.id, version: report.version, comment: comment || undefined }, { onSuccess: onClose })
      }
    />
  );
}

export function ReturnDialog({ report, onClose }: Base) {
  const ret = useReturnReport();
  return (
    <NoteDialog
      title={`Send the draft of ${reportTitle(report)} back?`}
      description={
        <>The engineer is told, with your comment. The draft stays as it is until they change it; nothing goes to {report.supplierName}.</>
      }
      label="Send back"
      noteLabel="What needs to change"
      required
      placeholder="e.g. ask Cpk 1.67 for the bond lines; the 3D snapshot is of an older revision."
      pending={ret.isPending}
      error={ret.error?.message}
      onClose={onClose}
      onConfirm={(comment) => ret.mutate({ id: report.id, version: report.version, comment }, { onSuccess: onClose })}
    />
  );
}

export function AcknowledgeDialog({ report, onClose }: Base) {
  const ack = useAcknowledgeReport();
  return (
    <NoteDialog
      title={`Acknowledge ${reportTitle(report)}`}
      description={
        <>
          You confirm that {report.supplierName} has received this report and will hold its {report.toleranceCount} tolerances with the
          capability asked. Your name and the time are recorded. If something is unclear, ask a question first.
        </>
      }
      label="Acknowledge"
      noteLabel="Comment"
      placeholder="e.g. which line or process this applies to."
      pending={ack.isPending}
      error={ack.error?.message}
      onClose={onClose}
      onConfirm={(comment) => ack.mutate({ id: report.id, version: report.version, comment: comment || undefined }, { onSuccess: onClose })}
    />
  );
}

/** The draft form as typed: Cpk is text until it is sent; no snapshot value keeps the stored picture. */
const DraftFormSchema = z
  .object({ cpk: z.string(), note: z.string(), snapshotPng: z.string().nullable().optional() })
  .transform(({ cpk, note, snapshotPng }): z.input<typeof UpdateReportSchema> => ({
    cpk: Number(cpk),
    note,
    ...(snapshotPng !== undefined ? { snapshotPng } : {}),
  }))
  .pipe(UpdateReportSchema);
type DraftForm = z.input<typeof DraftFormSchema>;

export function EditDraftDialog({ report, onClose }: Base) {
  const update = useUpdateReport();
  const defaultValues: DraftForm = { cpk: report.capability.cpk.toFixed(2), note: report.note, snapshotPng: undefined };
  const form = useForm({ resolver: zodResolver(DraftFormSchema), defaultValues });
  const { errors } = form.formState;
  const snapshot = form.watch("snapshotPng");

  async function pick(file: File | undefined) {
    if (!file) return;
    try {
      form.setValue("snapshotPng", await readPng(file));
      form.clearErrors("snapshotPng");
    } catch (e) {
      form.setError("snapshotPng", { type: "file", message: e instanceof Error ? e.message : "The image could not be read." });
    }
  }

  const submit = form.handleSubmit((changes) =>
    update.mutate(
      { id: report.id, version: report.version, changes },
      { onSuccess: onClose, onError: (err) => setServerErrors(form, err) },
    ),
  );

  const hasSnapshot = snapshot === undefined ? report.hasSnapshot : snapshot !== null;
  return (
    <Dialog
      open
      onClose={onClose}
      title={`Change the draft of ${reportTitle(report)}`}
      description="The tables are worked out again from the same study with these settings."
      busy={update.isPending}
      onSubmit={submit}
      formLabel="Change the draft"
      footer={
        <>
          <Button variant="secondary" onClick={onClose} disabled={update.isPending}>
            Cancel
          </Button>
          <Button type="submit" variant="primary" pending={update.isPending}>
            Save draft
          </Button>
        </>
      }
    >
      <div className="space-y-4">
        <Field label="Capability asked" aside="Cpk ≥" error={errors.cpk?.message}>
          {({ id, describedBy, invalid }) => (
            <Input
              id={id}
              aria-describedby={describedBy}
              invalid={invalid}
              inputMode="decimal"
              className="num w-32"
              {...form.register("cpk")}
            />
          )}
        </Field>
        <Field label="Note to the supplier" aside="optional" error={errors.note?.message}>
          {({ id, describedBy, invalid }) => (
            <Textarea id={id} aria-describedby={describedBy} invalid={invalid} rows={2} {...form.register("note")} />
          )}
        </Field>
        <Field
          label="3D snapshot"
          aside="PNG"
          error={errors.snapshotPng?.message}
          hint={hasSnapshot ? "The cover shows this picture." : "The cover shows a schematic side view."}
        >
          {({ id, describedBy }) => (
            <div className="flex items-center gap-2">
              <input
                id={id}
                type="file"
                accept="image/png"
                aria-describedby={describedBy}
                onChange={(e) => void pick(e.target.files?.[0])}
                className="block min-w-0 flex-1 text-xs text-ink/70 file:mr-3 file:h-7.5 file:rounded-md file:border file:border-line file:bg-panel file:px-3 file:text-xs file:font-semibold file:text-ink"
              />
              {hasSnapshot ? (
                <Button size="sm" variant="ghost" onClick={() => form.setValue("snapshotPng", null)}>
                  Remove
                </Button>
              ) : null}
            </div>
          )}
        </Field>
        {errors.root?.server ? <Alert>{errors.root.server.message}</Alert> : null}
      </div>
    </Dialog>
  );
}

export function DiscardDialog({ report, onClose, onDiscarded }: Base & { onDiscarded: () => void }) {
  const del = useDeleteReport();
  return (
    <ConfirmDialog
      open
      onClose={onClose}
      title={`Discard the draft of ${reportTitle(report)}?`}
      confirmLabel="Discard draft"
      pending={del.isPending}
      error={del.error?.message}
      onConfirm={() => del.mutate(report, { onSuccess: onDiscarded })}
    >
      <p>The draft and its comments are removed. Released revisions of this report stay as they are.</p>
    </ConfirmDialog>
  );
}
