import { zodResolver } from "@hookform/resolvers/zod";
import { useForm } from "react-hook-form";
import * as z from "zod";
import { REPORT_FILE_KINDS, SendReportSchema, type Report, type ReportFileKind, type SendResult } from "@shared/schemas/reports";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { Dialog } from "@frontend/components/ui/dialog";
import { Field, Input, Textarea } from "@frontend/components/ui/field";
import { firstErrorMessage, sentence, setServerErrors } from "@frontend/lib/form";
import { useSendReport } from "../api/send-report";
import { reportTitle } from "./report-status";

const FILE_LABEL: Record<ReportFileKind, string> = { pdf: "PDF", xlsx: "Spreadsheet (xlsx)", csv: "CSV" };

/** Addresses typed into one box, separated by commas, semicolons or spaces. */
export function splitAddresses(text: string): string[] {
  return text
    .split(/[\s,;]+/)
    .map((s) => s.trim())
    .filter(Boolean);
}

/** The first message about a list field or any of its items ("cc" or "cc.2"). */
function listError(errors: unknown): string | undefined {
  const message = firstErrorMessage(errors);
  return message === undefined ? undefined : sentence(message);
}

/** The dialog as typed: no recipients chosen yet means every contact; CC is one text. */
const SendFormSchema = z
  .object({
    message: z.string(),
    contactIds: z.array(z.string()).nullable(),
    cc: z.string(),
    attachments: z.array(z.enum(REPORT_FILE_KINDS)),
  })
  .transform((v): z.input<typeof SendReportSchema> => ({
    message: v.message.trim() || undefined,
    ...(v.contactIds !== null ? { contactIds: v.contactIds } : {}),
    cc: splitAddresses(v.cc),
    attachments: REPORT_FILE_KINDS.filter((k) => v.attachments.includes(k)),
  }))
  .pipe(SendReportSchema);
type SendForm = z.input<typeof SendFormSchema>;
const BLANK: SendForm = { message: "", contactIds: null, cc: "", attachments: ["pdf"] };

/**
 * Sending a released report: which of the supplier's contacts receive it (all by default),
 * addresses to copy in, and which released files are attached. The server checks the same.
 */
export function SendDialog({
  report,
  contacts,
  onClose,
  onSent,
}: {
  report: Report;
  contacts: Array<{ id: string; name: string; email: string }> | null;
  onClose: () => void;
  onSent: (r: SendResult) => void;
}) {
  const send = useSendReport();
  const form = useForm({ resolver: zodResolver(SendFormSchema), defaultValues: BLANK });
  const { errors } = form.formState;
  const chosen = form.watch("contactIds");
  const attachments = form.watch("attachments");
  const picked = chosen ?? (contacts ?? []).map((c) => c.id);
  const toggle = <T,>(list: T[], v: T) => (list.includes(v) ? list.filter((x) => x !== v) : [...list, v]);

  const submit = form.handleSubmit((body) =>
    send.mutate({ id: report.id, body }, { onSuccess: (r) => (onSent(r), onClose()), onError: (err) => setServerErrors(form, err) }),
  );

  const none = contacts !== null && contacts.length === 0;
  return (
    <Dialog
      open
      onClose={onClose}
      title={`Send ${reportTitle(report)} to ${report.supplierName}`}
      description="Each person chosen receives a message with the link to this page and the files you attach; a CC address gets a copy."
      busy={send.isPending}
      onSubmit={submit}
      formLabel="Send report"
      footer={
        <>
          <Button variant="secondary" onClick={onClose} disabled={send.isPending}>
            Cancel
          </Button>
          <Button type="submit" variant="primary" pending={send.isPending} disabled={none || picked.length === 0}>
            Send report
          </Button>
        </>
      }
    >
      <div className="space-y-4">
        {contacts === null ? null : none ? (
          <Alert>{report.supplierName} has no contacts. An admin adds them on the Suppliers page.</Alert>
        ) : (
          <fieldset className="min-w-0">
            <legend className="mb-1 text-xs font-semibold text-ink/80">Recipients at {report.supplierName}</legend>
            <ul className="divide-y divide-line rounded-md border border-line bg-paper/50 text-[13px]" aria-label="Recipients">
              {contacts.map((c) => (
                <li key={c.id}>
                  <label className="flex cursor-pointer items-center gap-2.5 px-3 py-1.5">
                    <input
                      type="checkbox"
                      checked={picked.includes(c.id)}
                      onChange={() => form.setValue("contactIds", toggle(picked, c.id))}
                      className="accent-[var(--color-mag)]"
                    />
                    <span className="font-semibold text-ink">{c.name}</span>
                    <span className="ml-auto text-ink/60">{c.email}</span>
                  </label>
                </li>
              ))}
            </ul>
            {listError(errors.contactIds) ? <p className="mt-1 text-xs font-medium text-fail">{listError(errors.contactIds)}</p> : null}
          </fieldset>
        )}
        <Field label="CC" aside="optional" hint="Addresses that get a copy, separated by commas." error={listError(errors.cc)}>
          {({ id, describedBy, invalid }) => (
            <Input
              id={id}
              aria-describedby={describedBy}
              invalid={invalid}
              placeholder="buyer@example.com"
              autoComplete="off"
              {...form.register("cc")}
            />
          )}
        </Field>
        <fieldset className="min-w-0">
          <legend className="mb-1 text-xs font-semibold text-ink/80">Attachments</legend>
          <div className="flex flex-wrap gap-4 text-[13px]">
            {REPORT_FILE_KINDS.map((k) => (
              <label key={k} className="flex cursor-pointer items-center gap-1.5">
                <input
                  type="checkbox"
                  checked={attachments.includes(k)}
                  onChange={() => form.setValue("attachments", toggle(attachments, k))}
                  className="accent-[var(--color-mag)]"
                />
                {FILE_LABEL[k]}
              </label>
            ))}
          </div>
          <p className="mt-1 text-xs text-ink/55">
            {attachments.length === 0 ? "Nothing attached: the message carries the link only." : "The files as released, unchanged."}
          </p>
          {listError(errors.attachments) ? <p className="mt-1 text-xs font-medium text-fail">{listError(errors.attachments)}</p> : null}
        </fieldset>
        <Field label="Message" aside="optional" error={errors.message?.message}>
          {({ id, describedBy }) => (
            <Textarea
              id={id}
              aria-describedby={describedBy}
              rows={3}
              placeholder="A line for the supplier, e.g. when you need the acknowledgement."
              {...form.register("message")}
            />
          )}
        </Field>
        {errors.root?.server ? <Alert>{errors.root.server.message}</Alert> : null}
      </div>
    </Dialog>
  );
}
