import { Alert } from "@frontend/components/ui/alert";
import { CheckIcon } from "@frontend/components/ui/icons";
import type { SendResult } from "@shared/schemas/reports";

/** A draft is not the supplier's to see: says so, in the words each side needs. */
export function DraftNotice({ asSupplier }: { asSupplier: boolean }) {
  return (
    <Alert tone="info" className="mb-4" title="Draft: not released">
      {asSupplier
        ? "This revision is not released."
        : "The supplier cannot see a draft. Downloads are marked DRAFT and made fresh each time; a reviewer's release makes the files final."}
    </Alert>
  );
}

/** Who received the report just sent, and who did not. */
export function SentNotice({ sent }: { sent: SendResult }) {
  const contacts = sent.sent.filter((s) => !s.cc);
  const copies = sent.sent.filter((s) => s.cc);
  const files = sent.report.sends[0]?.attachments ?? ["pdf"];
  const names: Record<string, string> = { pdf: "PDF", xlsx: "spreadsheet", csv: "CSV" };
  const attached = files.length
    ? `with the ${files.map((f) => names[f] ?? f).join(files.length === 2 ? " and " : ", ")} attached`
    : "with the link only";
  return (
    <div role="status" className="mb-4 flex gap-2.5 rounded-md border border-pass/25 bg-pass/[0.06] px-3 py-2.5 text-[13px]">
      <CheckIcon className="mt-0.5 shrink-0 text-pass" />
      <div>
        <p className="font-semibold text-ink">
          Sent to {contacts.length} contact{contacts.length === 1 ? "" : "s"} {attached}
          {copies.length ? `, a copy to ${copies.length}` : ""}
        </p>
        <p className="text-ink/70">{sent.sent.map((s) => (s.cc ? `cc ${s.email}` : s.email)).join(", ")}</p>
        {sent.failed.length ? (
          <p className="text-fail">Not delivered: {sent.failed.map((f) => `${f.email} (${f.error})`).join(", ")}</p>
        ) : null}
      </div>
    </div>
  );
}
