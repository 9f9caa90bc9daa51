import type { QueryClient } from "@tanstack/react-query";
import { queryOptions, useQuery } from "@tanstack/react-query";
import type { LoaderFunctionArgs } from "react-router";
import { ServerStatusSchema } from "@shared/schemas/server-status";
import { formatCount } from "@shared/format";
import { Alert } from "@frontend/components/ui/alert";
import { PageHeader } from "@frontend/components/ui/page-header";
import { Panel } from "@frontend/components/ui/panel";
import { Table, TableFrame, Td, Th, THead, Tr } from "@frontend/components/ui/table";
import { api } from "@frontend/lib/api-client";
import { formatDateTime, formatRelative } from "@frontend/lib/format";
import { requirePermission } from "../../route-guards";

const statusQueryOptions = () =>
  queryOptions({ queryKey: ["server-status"], queryFn: () => api.get("/api/status", ServerStatusSchema), refetchInterval: 5000 });

export const statusLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    await requirePermission(queryClient, request, "status.read");
    await queryClient.prefetchQuery(statusQueryOptions());
    return null;
  };

function Figure({ label, value, note }: { label: string; value: string; note?: string }) {
  return (
    <div className="rounded-lg border border-line bg-panel px-4 py-3">
      <p className="text-xs font-semibold text-ink/55">{label}</p>
      <p className="mt-0.5 text-[22px] font-extrabold text-ink tabular-nums">{value}</p>
      {note ? <p className="text-xs text-ink/55">{note}</p> : null}
    </div>
  );
}

/** The admin's view of where studies run: this server's threads, and in server mode the job queue and its workers. */
export function StatusRoute() {
  const status = useQuery(statusQueryOptions());
  const s = status.data;
  return (
    <>
      <PageHeader title="Server status" description="Where studies run and how busy that is. Refreshed every few seconds." />
      {status.isError ? <Alert>{status.error.message}</Alert> : null}
      {s ? (
        <div className="space-y-5">
          <div className="grid gap-3 sm:grid-cols-2 lg:grid-cols-4">
            <Figure label="Studies waiting" value={formatCount(s.studies.queued)} />
            <Figure label="Studies running" value={formatCount(s.studies.running)} />
            <Figure
              label="Engine threads in this server"
              value={formatCount(s.engine.threads)}
              note={`${s.engine.activeStudies} study open`}
            />
            <Figure label="Server started" value={formatRelative(s.startedAt)} note={formatDateTime(s.startedAt)} />
          </div>
          <Panel title="Job queue" padded={false}>
            {s.queue ? (
              <>
                <p className="px-4 pt-3 text-[13px] text-ink/70">
                  {formatCount(s.queue.depth)} job{s.queue.depth === 1 ? "" : "s"} waiting (study parts, sweeps and allocations),{" "}
                  {formatCount(s.queue.active)} being worked on. Worker processes seen in the last minute:
                </p>
                <TableFrame className="m-4">
                  <Table aria-label="Worker processes">
                    <THead>
                      <tr>
                        <Th>Host</Th>
                        <Th align="right">Process</Th>
                        <Th align="right">Threads</Th>
                        <Th align="right">Jobs done</Th>
                        <Th align="right">Last seen</Th>
                      </tr>
                    </THead>
                    <tbody>
                      {s.queue.workers.map((w) => (
                        <Tr key={w.id}>
                          <Td className="font-semibold">{w.host}</Td>
                          <Td numeric>{w.pid}</Td>
                          <Td numeric>{w.threads}</Td>
                          <Td numeric>{formatCount(w.jobsDone)}</Td>
                          <Td numeric>{formatRelative(w.seenAt)}</Td>
                        </Tr>
                      ))}
                    </tbody>
                  </Table>
                </TableFrame>
                {s.queue.workers.length === 0 ? (
                  <p className="px-4 pb-4 text-[13px] text-fail">No worker process has been seen in the last minute.</p>
                ) : null}
              </>
            ) : (
              <p className="px-4 py-3 text-[13px] text-ink/70">
                One machine: studies run in this server&apos;s own engine threads. With a PostgreSQL server (DATABASE_URL), they go through
                a job queue that worker processes on other machines take from; see docs/deployment.md.
              </p>
            )}
          </Panel>
        </div>
      ) : null}
    </>
  );
}
