import type { ResultFile } from "@shared/schemas/result-file";
import { ChartFileName } from "@frontend/components/ui/chart-download";
import { Panel } from "@frontend/components/ui/panel";
import type { StudyDetail } from "../api/get-study";
import { SERIES_A, SERIES_B } from "./chart-theme";
import { PercentileTable } from "./compare-percentile-table";
import { RequirementsCompared } from "./compare-requirements-table";
import { TolerancesThatDiffer } from "./compare-tolerance-changes";
import { TopContributors } from "./compare-top-contributors";
import { EnvelopeCharts } from "./envelope-charts";
import { StudyCautions } from "./study-cautions";

/** Everything compared once both studies have a result. */
export function CompareResults({ a, b, ra, rb }: { a: StudyDetail; b: StudyDetail; ra: ResultFile; rb: ResultFile }) {
  const headingReq =
    ra.requirements.find((r) => r.metric === "heading.maxAbsDeg") ?? rb.requirements.find((r) => r.metric === "heading.maxAbsDeg");
  return (
    <>
      <StudyCautions />
      <RequirementsCompared ra={ra} rb={rb} />

      <Panel title="Key percentiles" meta="of the absolute value; lower is better">
        <PercentileTable ra={ra} rb={rb} elementOrder={((a.stack.elements ?? []) as { id: string }[]).map((e) => e.id)} />
      </Panel>

      {ra.envelope && rb.envelope ? (
        <Panel title="Heading-error envelopes" meta="A and B overlaid" accent="var(--color-mag)">
          <ChartFileName value={`study-${a.number}-vs-study-${b.number}`}>
            <EnvelopeCharts
              layers={[
                { key: "a", name: `A · study ${a.number}`, colour: SERIES_A, envelope: ra.envelope },
                { key: "b", name: `B · study ${b.number}`, colour: SERIES_B, envelope: rb.envelope },
              ]}
              limitDeg={headingReq?.max}
            />
          </ChartFileName>
        </Panel>
      ) : null}

      <div className="grid gap-4 xl:grid-cols-2">
        <TolerancesThatDiffer ra={ra} rb={rb} />
        <Panel title="Top contributors" meta="linearised share of each requirement">
          <TopContributors ra={ra} rb={rb} />
        </Panel>
      </div>
    </>
  );
}
