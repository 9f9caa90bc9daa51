import { useState } from "react";
import { Link } from "react-router";
import type { StudySummary } from "@shared/schemas/studies";
import { EmptyState } from "@frontend/components/ui/empty-state";
import { PlusIcon } from "@frontend/components/ui/icons";
import { Panel } from "@frontend/components/ui/panel";
import { Spinner } from "@frontend/components/ui/spinner";
import { cn } from "@frontend/lib/cn";
import { formatDateTime, formatRelative } from "@frontend/lib/format";
import { useStudies } from "../api/get-studies";
import { StudyStatusBadge, VerdictBadge } from "./study-status-badge";
import { formatCount } from "@shared/format";

const SHOWN = 6;

const linkButton = "inline-flex h-7 items-center gap-1.5 rounded-md px-2.5 text-xs font-semibold whitespace-nowrap transition-colors";

/** The project's studies on its page: newest first, with progress while one runs. */
export function StudiesPanel({ projectId, canRun, className }: { projectId: string; canRun: boolean; className?: string }) {
  const studies = useStudies(projectId);
  const [all, setAll] = useState(false);
  const list = studies.data ?? [];
  const shown = all ? list : list.slice(0, SHOWN);
  const finished = list.filter((s) => s.status === "finished");
  const latest = list[0];
  const newHref = `/projects/${projectId}/studies/new${latest ? `?revision=${latest.revisionId}&from=${latest.id}` : ""}`;
  const compareHref =
    finished.length >= 2
      ? `/projects/${projectId}/compare?a=${finished[1].id}&b=${finished[0].id}`
      : `/projects/${projectId}/compare${finished[0] ? `?a=${finished[0].id}` : ""}`;

  return (
    <Panel
      title="Studies"
      meta={list.length ? `${list.length}` : undefined}
      accent="var(--color-gyro)"
      padded={false}
      className={cn("md:col-span-2", className)}
      actions={
        <>
          {list.length ? (
            <Link to={compareHref} className={`${linkButton} text-ink/75 hover:bg-ink/[0.06] hover:text-ink`}>
              Compare two
            </Link>
          ) : null}
          {canRun ? (
            <Link to={newHref} className={`${linkButton} border border-ink bg-ink text-paper hover:bg-ink/90`}>
              <PlusIcon size={14} /> New study
            </Link>
          ) : null}
        </>
      }
    >
      {studies.isPending ? (
        <p className="flex items-center gap-2 px-4 py-6 text-[13px] text-ink/55">
          <Spinner /> Loading studies…
        </p>
      ) : studies.isError ? (
        <p className="px-4 py-6 text-[13px] text-fail">{studies.error.message}</p>
      ) : list.length === 0 ? (
        <EmptyState title="No study yet" className="py-8">
          A study runs a stack revision through Monte Carlo trials: predicted yield per requirement, ppm out, and what drives it.
        </EmptyState>
      ) : (
        <>
          <div className="overflow-x-auto">
            <table className="w-full border-collapse text-[13px]" aria-label="Studies">
              <thead className="border-b border-line bg-paper/70">
                <tr>
                  <th scope="col" className="h-7 px-3 text-left text-2xs font-bold tracking-[0.06em] text-ink/55 uppercase">
                    Study
                  </th>
                  <th scope="col" className="h-7 px-3 text-right text-2xs font-bold tracking-[0.06em] text-ink/55 uppercase">
                    Rev
                  </th>
                  <th scope="col" className="h-7 px-3 text-right text-2xs font-bold tracking-[0.06em] text-ink/55 uppercase">
                    Trials
                  </th>
                  <th scope="col" className="h-7 px-3 text-right text-2xs font-bold tracking-[0.06em] text-ink/55 uppercase">
                    Seed
                  </th>
                  <th scope="col" className="h-7 px-3 text-left text-2xs font-bold tracking-[0.06em] text-ink/55 uppercase">
                    Status
                  </th>
                  <th scope="col" className="h-7 px-3 text-left text-2xs font-bold tracking-[0.06em] text-ink/55 uppercase">
                    Result
                  </th>
                  <th scope="col" className="h-7 px-3 text-right text-2xs font-bold tracking-[0.06em] text-ink/55 uppercase">
                    When
                  </th>
                </tr>
              </thead>
              <tbody>
                {shown.map((s) => (
                  <StudyRow key={s.id} study={s} projectId={projectId} />
                ))}
              </tbody>
            </table>
          </div>
          {list.length > SHOWN ? (
            <button
              type="button"
              onClick={() => setAll((v) => !v)}
              className="w-full border-t border-line px-4 py-2 text-left text-xs font-semibold text-ink/60 hover:text-ink"
            >
              {all ? "Show the newest only" : `Show all ${list.length} studies`}
            </button>
          ) : null}
        </>
      )}
    </Panel>
  );
}

function StudyRow({ study: s, projectId }: { study: StudySummary; projectId: string }) {
  const active = s.status === "running" || s.status === "queued";
  const pct = s.progress.total > 0 ? (100 * s.progress.done) / s.progress.total : 0;
  const when = s.finishedAt ?? s.startedAt ?? s.createdAt;
  return (
    <tr className="border-b border-line/70 last:border-b-0 hover:bg-paper/60">
      <td className="h-10 px-3 py-1.5">
        <Link
          to={`/projects/${projectId}/studies/${s.id}`}
          className="font-bold whitespace-nowrap text-ink hover:text-gyro hover:underline"
        >
          Study {s.number}
        </Link>
        {s.label ? (
          <span className="ml-2 inline-block max-w-[22rem] truncate align-bottom text-xs text-ink/55" title={s.label}>
            {s.label}
          </span>
        ) : null}
      </td>
      <td className="num px-3 text-xs font-semibold text-ink/70">{s.revisionNumber}</td>
      <td className="num px-3 text-xs text-ink/70">{formatCount(s.trials)}</td>
      <td className="num px-3 text-xs text-ink/55">{s.seed}</td>
      <td className="px-3">
        {active ? (
          <div
            className="flex items-center gap-2"
            aria-label={`Study ${s.number}: ${s.status === "queued" ? "queued" : `${Math.floor(pct)} % done`}`}
          >
            <StudyStatusBadge status={s.status} />
            <span className="h-1.5 w-24 overflow-hidden rounded-full bg-line/70">
              <span className="block h-full rounded-full bg-gyro transition-[width] duration-700" style={{ width: `${pct}%` }} />
            </span>
            <span className="text-2xs text-ink/60 tabular-nums">{s.status === "queued" ? "" : `${Math.floor(pct)} %`}</span>
          </div>
        ) : (
          <StudyStatusBadge status={s.status} />
        )}
      </td>
      <td className="px-3">
        {s.status === "finished" ? (
          s.passes === null ? (
            <span className="text-xs text-ink/45">no requirements</span>
          ) : (
            <VerdictBadge passes={s.passes} />
          )
        ) : (
          <span className="text-xs text-ink/35">—</span>
        )}
      </td>
      <td className="num px-3 text-xs whitespace-nowrap text-ink/60">
        <time dateTime={when} title={formatDateTime(when)}>
          {formatRelative(when)}
        </time>
      </td>
    </tr>
  );
}
