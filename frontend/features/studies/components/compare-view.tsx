import type { RevisionSummary } from "@shared/schemas/revisions";
import type { StudySummary } from "@shared/schemas/studies";
import { Panel } from "@frontend/components/ui/panel";
import type { StudyDetail } from "../api/get-study";
import { SERIES_A, SERIES_B } from "./chart-theme";
import { CompareResults } from "./compare-results";
import { CompareRunElsewhere } from "./compare-run-elsewhere";
import { SidePicker } from "./compare-side-picker";
import { SettingsTable } from "./compare-settings-table";

export function CompareView({
  studies,
  revisions,
  a,
  b,
  onPick,
  canRun,
}: {
  studies: StudySummary[];
  revisions: RevisionSummary[];
  a: StudyDetail | null;
  b: StudyDetail | null;
  onPick: (side: "a" | "b", id: string | null) => void;
  canRun: boolean;
}) {
  const ra = a?.result ?? null;
  const rb = b?.result ?? null;
  return (
    <div className="flex flex-col gap-4">
      <div className="grid gap-3 xl:grid-cols-2">
        <SidePicker side="a" colour={SERIES_A} studies={studies} study={a} onPick={(id) => onPick("a", id)} other={b?.id} />
        <SidePicker side="b" colour={SERIES_B} studies={studies} study={b} onPick={(id) => onPick("b", id)} other={a?.id} />
      </div>

      {a && canRun ? <CompareRunElsewhere source={a} revisions={revisions} onStarted={(id) => onPick("b", id)} /> : null}

      {a && b ? (
        <>
          <Panel title="Settings" meta="rows that differ are marked">
            <SettingsTable a={a} b={b} />
          </Panel>
          {ra && rb ? (
            <CompareResults a={a} b={b} ra={ra} rb={rb} />
          ) : (
            <p className="text-[13px] text-ink/60">The comparison fills in when both studies have finished.</p>
          )}
        </>
      ) : (
        <p className="rounded-lg border border-dashed border-line bg-panel px-4 py-6 text-center text-[13px] text-ink/60">
          Choose two studies of this project{a ? ", or run study A's settings on another revision" : ""}.
        </p>
      )}
    </div>
  );
}
