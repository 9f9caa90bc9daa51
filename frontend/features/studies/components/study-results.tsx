import { useMemo, useState, type ReactNode } from "react";
import type { ResultFile } from "@shared/schemas/result-file";
import { ChartFileName } from "@frontend/components/ui/chart-download";
import { Panel } from "@frontend/components/ui/panel";
import type { StudyDetail } from "../api/get-study";
import { ContributorsPanel } from "./contributors-pareto";
import { ConvergencePanel } from "./convergence-chart";
import { CrossAxisTables } from "./cross-axis-tables";
import { EnvelopeCharts } from "./envelope-charts";
import { HistogramPanel } from "./histogram-chart";
import { MetricsTable } from "./metrics-table";
import { RequirementCards } from "./requirement-cards";
import { RunRecord } from "./run-record";
import { StackUpPanel } from "./stack-up-panel";
import { CalibrationNote, StudyCautions } from "./study-cautions";
import { TrialViewerSheet, type WorstTrialPick } from "./trial-viewer-sheet";
import { WorstTrials } from "./worst-trials";
import { SERIES_A } from "./chart-theme";
import { metricLabel } from "@shared/metrics";
import { formatValue } from "@shared/format";

/**
 * The figures of a finished study. Choosing a requirement card points the histogram, the
 * contributors, the convergence and the worst trials at its metric; each panel can also
 * pick its own.
 */
export function StudyResults({
  study,
  result,
  fileBase = `study-${study.number}`,
}: {
  study: StudyDetail;
  result: ResultFile;
  /** what downloaded charts are named after (`<project>-study-<n>`) */
  fileBase?: string;
}) {
  const stack = study.stack;
  const elements = stack.elements;
  const elementOrder = useMemo(() => elements.map((e) => e.id), [elements]);
  const kinds = useMemo(() => new Map(elements.map((e) => [e.id, e.kind] as const)), [elements]);
  const kindOf = (id: string) => kinds.get(id);

  const firstReq =
    result.requirements[0]?.metric ?? (result.metrics["heading.maxAbsDeg"] ? "heading.maxAbsDeg" : Object.keys(result.metrics)[0]);
  const [focus, setFocus] = useState<string>(firstReq);
  // Each panel follows the focus when the metric is one it can show, and keeps its own otherwise.
  const [histMetric, setHistMetric] = useFollow(focus, (m) => m in result.histograms, firstReq);
  const [contribMetric, setContribMetric] = useFollow(
    focus,
    (m) => result.contributors.some((c) => c.metric === m),
    result.contributors[0]?.metric ?? "",
  );
  const [convMetric, setConvMetric] = useFollow(
    focus,
    (m) => result.convergence.some((c) => c.metric === m),
    result.convergence[0]?.metric ?? "",
  );
  const [worstMetric, setWorstMetric] = useFollow(focus, (m) => (result.worstTrials[m]?.length ?? 0) > 0, firstReq);

  const [viewer, setViewer] = useState<{ trial: number | null; metric: string } | null>(null);
  const picks: WorstTrialPick[] = useMemo(() => {
    const order = [
      ...result.requirements.map((r) => r.metric),
      ...Object.keys(result.worstTrials).filter((k) => !result.requirements.some((r) => r.metric === k)),
    ];
    return order.flatMap((m) =>
      (result.worstTrials[m] ?? [])
        .slice(0, 3)
        .map((w) => ({ metric: m, trialIndex: w.trial, value: w.value, unit: result.metrics[m]?.unit === "%" ? "%" : "°" })),
    );
  }, [result]);
  const headingReq = result.requirements.find((r) => r.metric === "heading.maxAbsDeg");
  const viewerCaption = (() => {
    if (!viewer || viewer.trial === null) return undefined;
    const w = result.worstTrials[viewer.metric]?.find((x) => x.trial === viewer.trial);
    return w ? `Worst ${metricLabel(viewer.metric)}: ${formatValue(w.value, result.metrics[viewer.metric]?.unit ?? "deg")}` : undefined;
  })();

  return (
    <ChartFileName value={fileBase}>
      <div className="flex flex-col gap-4">
        <StudyCautions />
        <CalibrationNote after={result.calibration} />
        <Section
          id="requirements"
          title="Requirements"
          meta={`${result.requirements.filter((r) => r.passes).length} of ${result.requirements.length} met`}
          bare
        >
          <RequirementCards result={result} selected={focus} onSelect={setFocus} />
        </Section>

        {result.envelope ? (
          <Section id="envelope" title="Heading-error envelope" meta="error against heading, for each tilt" accent="var(--color-mag)">
            <EnvelopeCharts
              layers={[{ key: "a", name: `Study ${study.number}`, colour: SERIES_A, envelope: result.envelope }]}
              limitDeg={headingReq?.max}
            />
          </Section>
        ) : null}

        <div className="grid gap-4 xl:grid-cols-2">
          <Section id="histogram" title="Distribution" meta="trials per bin">
            <HistogramPanel
              result={result}
              metric={histMetric}
              onMetric={(m) => {
                setHistMetric(m);
                setFocus(m);
              }}
              elementOrder={elementOrder}
            />
          </Section>
          <Section id="cross-axis" title="Cross-axis matrices" meta="each sensor, at a percentile" accent="var(--color-gyro)">
            <CrossAxisTables result={result} kindOf={kindOf} elementOrder={elementOrder} />
          </Section>
        </div>

        <Section id="contributors" title="Contributors" meta="ranked by share of variance" accent="var(--color-accel)">
          <ContributorsPanel
            result={result}
            metric={contribMetric}
            onMetric={(m) => {
              setContribMetric(m);
              setFocus(m);
            }}
            kindOf={kindOf}
            elementOrder={elementOrder}
          />
        </Section>

        <div className="grid gap-4 xl:grid-cols-2">
          <Section id="stack-up" title="Worst case, RSS and Monte Carlo">
            <StackUpPanel result={result} elementOrder={elementOrder} />
          </Section>
          <Section id="convergence" title="Convergence" meta="the percentile against trials">
            <ConvergencePanel
              result={result}
              metric={convMetric}
              onMetric={(m) => {
                setConvMetric(m);
                setFocus(m);
              }}
            />
          </Section>
        </div>

        <div className="grid gap-4 xl:grid-cols-[minmax(0,1fr)_minmax(0,1fr)]">
          <Section id="worst-trials" title="Worst trials" meta="open any in the 3D view">
            <WorstTrials
              result={result}
              metric={worstMetric}
              onMetric={setWorstMetric}
              onOpen={(metric, trial) => setViewer({ metric, trial })}
              elementOrder={elementOrder}
            />
          </Section>
          <Section id="record" title="Settings and run">
            <RunRecord study={study} />
          </Section>
        </div>

        <Section id="metrics" title="Metrics" meta="key percentiles of the absolute value">
          <MetricsTable result={result} elementOrder={elementOrder} />
        </Section>

        <TrialViewerSheet
          open={viewer !== null}
          onClose={() => setViewer(null)}
          studyNumber={study.number}
          revisionNumber={study.revisionNumber}
          stack={stack}
          study={study.study}
          worstTrials={picks}
          trialIndex={viewer?.trial ?? null}
          onTrialChange={(t) => setViewer((v) => (v ? { ...v, trial: t } : v))}
          caption={viewerCaption}
        />
      </div>
    </ChartFileName>
  );
}

function useFollow(focus: string, accepts: (m: string) => boolean, fallback: string): [string, (m: string) => void] {
  const [own, setOwn] = useState(accepts(focus) ? focus : fallback);
  const [seen, setSeen] = useState(focus);
  if (seen !== focus) {
    setSeen(focus);
    if (accepts(focus)) setOwn(focus);
  }
  return [own, setOwn];
}

function Section({
  id,
  title,
  meta,
  accent,
  bare = false,
  children,
}: {
  id: string;
  title: string;
  meta?: string;
  accent?: string;
  bare?: boolean;
  children: ReactNode;
}) {
  if (bare) {
    return (
      <section aria-labelledby={`${id}-title`} id={id}>
        <div className="mb-2 flex items-baseline gap-2">
          <h2 id={`${id}-title`} className="text-[13px] font-bold text-ink">
            {title}
          </h2>
          {meta ? <span className="text-xs text-ink/50">{meta}</span> : null}
        </div>
        {children}
      </section>
    );
  }
  return (
    <div id={id} role="region" aria-label={title} className="min-w-0">
      <Panel title={title} meta={meta} accent={accent} className="h-full">
        {children}
      </Panel>
    </div>
  );
}
