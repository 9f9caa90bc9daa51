import { useState } from "react";
import type { QueryClient } from "@tanstack/react-query";
import type { LoaderFunctionArgs } from "react-router";
import type { OutboxMessage } from "@shared/schemas/reports";
import { Alert } from "@frontend/components/ui/alert";
import { EmptyState } from "@frontend/components/ui/empty-state";
import { OutboxIcon } from "@frontend/components/ui/icons";
import { PageHeader } from "@frontend/components/ui/page-header";
import { Spinner } from "@frontend/components/ui/spinner";
import { Table, TableFrame, Td, Th, THead, Tr } from "@frontend/components/ui/table";
import { outboxQueryOptions, useOutbox } from "@frontend/features/reports/api/get-outbox";
import { formatDateTime, formatRelative } from "@frontend/lib/format";
import { requirePermission } from "../../route-guards";
import { formatBytes } from "@shared/format";

export const outboxLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, "outbox.read");
    await queryClient.prefetchQuery(outboxQueryOptions());
    return null;
  };

/** What the local mail catcher received: report e-mails and invitations, with their attachments. */
export function OutboxRoute() {
  const outbox = useOutbox();
  const [open, setOpen] = useState<string | null>(null);
  const mode = outbox.data?.mode;

  return (
    <>
      <PageHeader
        title="Outbox"
        description={
          mode === "smtp"
            ? `Mail leaves this server through ${outbox.data?.address}. The outbox shows only what a local mail catcher receives, so it stays empty here.`
            : `Mail from this server goes to the local mail catcher${outbox.data?.address ? ` on ${outbox.data.address}` : ""}; nothing leaves this machine. Every message shows here as it arrived.`
        }
      />
      {outbox.isPending ? (
        <p className="flex items-center gap-2 text-[13px] text-ink/55">
          <Spinner /> Loading messages…
        </p>
      ) : outbox.isError ? (
        <Alert title="The outbox could not be loaded">{outbox.error.message}</Alert>
      ) : outbox.data.messages.length === 0 ? (
        <div className="rounded-lg border border-line bg-panel">
          <EmptyState icon={<OutboxIcon />} title="No mail yet" className="py-14">
            Invitations and reports sent to suppliers appear here.
          </EmptyState>
        </div>
      ) : (
        <TableFrame>
          <Table aria-label="Messages">
            <THead>
              <tr>
                <Th className="w-44">Received</Th>
                <Th>To</Th>
                <Th>Subject</Th>
                <Th>Attachments</Th>
                <Th align="right">Size</Th>
              </tr>
            </THead>
            <tbody>
              {outbox.data.messages.map((m) => (
                <MessageRow key={m.id} m={m} open={open === m.id} onToggle={() => setOpen(open === m.id ? null : m.id)} />
              ))}
            </tbody>
          </Table>
        </TableFrame>
      )}
    </>
  );
}

function MessageRow({ m, open, onToggle }: { m: OutboxMessage; open: boolean; onToggle: () => void }) {
  return (
    <>
      <Tr className="align-top">
        <Td className="py-2 whitespace-nowrap text-ink/70 tabular-nums">
          <time dateTime={m.receivedAt} title={formatDateTime(m.receivedAt)}>
            {formatDateTime(m.receivedAt)}
          </time>
          <p className="text-2xs text-ink/45">{formatRelative(m.receivedAt)}</p>
        </Td>
        <Td className="py-2 text-ink/85">{m.to.join(", ")}</Td>
        <Td className="py-2">
          <button
            type="button"
            onClick={onToggle}
            aria-expanded={open}
            className="text-left font-semibold text-ink hover:text-gyro hover:underline"
          >
            {m.subject || "(no subject)"}
          </button>
          <p className="text-2xs text-ink/45">from {m.from}</p>
        </Td>
        <Td className="py-2">
          {m.attachments.length === 0 ? (
            <span className="text-ink/40">—</span>
          ) : (
            <ul className="space-y-0.5">
              {m.attachments.map((a) => (
                <li key={a.index}>
                  <a
                    href={`/api/outbox/${m.id}/attachments/${a.index}`}
                    download
                    className="text-xs font-semibold text-gyro underline-offset-2 hover:underline"
                  >
                    {a.fileName}
                  </a>{" "}
                  <span className="text-2xs text-ink/50 tabular-nums">{formatBytes(a.size)}</span>
                </li>
              ))}
            </ul>
          )}
        </Td>
        <Td numeric className="py-2 text-ink/60">
          {formatBytes(m.size)}
        </Td>
      </Tr>
      {open ? (
        <tr className="border-b border-line/70 bg-paper/50">
          <td colSpan={5} className="px-3 py-3">
            <pre className="max-h-80 overflow-auto font-sans text-[13px] leading-5 whitespace-pre-wrap text-ink/80">
              {m.text || "(no text part)"}
            </pre>
          </td>
        </tr>
      ) : null}
    </>
  );
}
