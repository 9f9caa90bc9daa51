import { useNavigate } from "react-router";
import type { StackFile } from "@shared/schemas/stack-file";
import type { StudyFile } from "@shared/schemas/study-file";
import { formatCount } from "@shared/format";
import { Alert } from "@frontend/components/ui/alert";
import { Panel } from "@frontend/components/ui/panel";
import { useAllocation, useApplyAllocation, useCancelAllocation, useCreateAllocation } from "../api/what-if";
import { AllocationForm } from "./allocation-form";
import { AllocationResult } from "./allocation-result";
import { RunCancelled, RunProgress } from "./run-progress";

/** Least-cost tolerances for the study's requirements: settings, progress, the proposal and its draft. */
export function AllocationPanel({
  projectId,
  revisionId,
  stack,
  study,
  canRun,
  canApply,
  runId,
  onRun,
}: {
  projectId: string;
  revisionId: string;
  stack: StackFile;
  study: StudyFile;
  canRun: boolean;
  canApply: boolean;
  runId: string | null;
  onRun: (id: string) => void;
}) {
  const create = useCreateAllocation();
  const allocation = useAllocation(runId);
  const apply = useApplyAllocation();
  const cancel = useCancelAllocation();
  const navigate = useNavigate();
  const a = allocation.data;

  return (
    <div className="flex flex-col gap-4">
      {canRun ? (
        <Panel title="Allocate tolerances" meta="least cost under every requirement, then checked by Monte Carlo">
          <AllocationForm
            stack={stack}
            defaultTrials={String(Math.min(study.trials, 20_000))}
            pending={create.isPending}
            onSubmit={(body, trials) =>
              create.mutate(
                { revisionId, body: { ...body, study: { ...study, trials } as Record<string, unknown> } },
                { onSuccess: (r) => onRun(r.id) },
              )
            }
          />
          {create.error ? (
            <Alert className="mt-3" title="The allocation was not started">
              {create.error.message}
            </Alert>
          ) : null}
        </Panel>
      ) : null}
      {a ? (
        <Panel title="Proposal" meta={`${formatCount(a.trials)} trials per verifying run · seed ${a.seed}`} accent="var(--color-gyro)">
          {a.status === "queued" || a.status === "running" ? (
            <RunProgress
              label="Allocation"
              status={a.status}
              done={a.progress.done}
              total={a.progress.total}
              onCancel={canRun ? () => cancel.mutate(a.id) : undefined}
              cancelling={cancel.isPending}
            />
          ) : null}
          {a.status === "cancelled" ? <RunCancelled what="allocation" done={a.progress.done} total={a.progress.total} /> : null}
          {cancel.error ? (
            <Alert className="mt-3" title="The allocation was not cancelled">
              {cancel.error.message}
            </Alert>
          ) : null}
          {a.status === "failed" || a.status === "interrupted" ? (
            <Alert title="The allocation stopped">{a.error ?? "No message was recorded."}</Alert>
          ) : null}
          {a.status === "finished" ? (
            <AllocationResult
              allocation={a}
              canApply={canApply}
              applying={apply.isPending}
              onApply={() => apply.mutate(a.id, { onSuccess: (rev) => navigate(`/projects/${projectId}/revisions/${rev.id}`) })}
            />
          ) : null}
          {apply.error ? (
            <Alert className="mt-3" title="No draft was made">
              {apply.error.message}
            </Alert>
          ) : null}
        </Panel>
      ) : null}
    </div>
  );
}
