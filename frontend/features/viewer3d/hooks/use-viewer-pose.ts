/**
 * Which stack and which pose the 3D view draws: the last valid stack while an edit is
 * incomplete, and the nominal pose, the tolerance means or one study trial (regenerated
 * from the seed), with the worst-trial picks and the text that describes the pose.
 */
import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import { type StackFile, validateStackFile } from "@shared/schemas/stack-file";
import type { StudyFile } from "@shared/schemas/study-file";
import { compileForViewer, drawsFor, type PoseChoice, poseSet } from "../lib/poses";
import { formatNumberUnit } from "@shared/format";
import { pathLabel, readableMessage } from "@shared/field-labels";

export interface WorstTrialPick {
  metric: string;
  trialIndex: number;
  value: number;
  unit?: string;
}

export interface ViewerPoseInput {
  stack: StackFile;
  study?: StudyFile;
  worstTrials?: WorstTrialPick[];
  /** controlled when not undefined */
  trialIndex?: number | null;
  onTrialChange?: (trialIndex: number | null) => void;
}

export function useViewerPose({ stack, study, worstTrials, trialIndex, onTrialChange }: ViewerPoseInput) {
  // ---- the stack: keep drawing the last valid one while an edit is incomplete
  const validation = useMemo(() => validateStackFile(stack), [stack]);
  const lastGood = useRef<StackFile | null>(null);
  if (validation.ok) lastGood.current = validation.stack;
  const drawn = validation.ok ? validation.stack : lastGood.current;
  const stackIssue = validation.ok
    ? null
    : // the place in words ("mag: thickness z (mm)"), never the file's path
      `${validation.issues[0]?.path ? `${pathLabel(validation.issues[0].path, stack)}: ` : ""}${readableMessage(validation.issues[0]?.message ?? "invalid stack", stack)}`;

  const vm = useMemo(() => {
    if (!drawn) return null;
    try {
      return compileForViewer(drawn, study);
    } catch {
      return null;
    }
  }, [drawn, study]);

  // ---- pose: controlled by trialIndex when given
  const controlled = trialIndex !== undefined;
  const [ownTrial, setOwnTrial] = useState<number | null>(null);
  const [meanPose, setMeanPose] = useState(false);
  const [pickedMetric, setPickedMetric] = useState<string | null>(null);
  const trial = controlled ? trialIndex : ownTrial;
  const setTrial = useCallback(
    (t: number | null) => {
      if (!controlled) setOwnTrial(t);
      onTrialChange?.(t);
    },
    [controlled, onTrialChange],
  );
  const choice: PoseChoice =
    trial !== null && trial !== undefined ? { kind: "trial", index: trial } : meanPose ? { kind: "mean" } : { kind: "nominal" };
  const choiceKey = choice.kind === "trial" ? `trial:${choice.index}` : choice.kind;

  const { set, poseError } = useMemo(() => {
    if (!vm || !drawn) return { set: null, poseError: null };
    if (choice.kind === "trial" && !vm.hasStudy) {
      return { set: poseSet(vm, drawn, drawsFor(vm, { kind: "nominal" })), poseError: "Trials need a study: showing the nominal pose." };
    }
    try {
      return { set: poseSet(vm, drawn, drawsFor(vm, choice)), poseError: null };
    } catch (error) {
      const message = error instanceof Error ? error.message : String(error);
      return { set: poseSet(vm, drawn, drawsFor(vm, { kind: "nominal" })), poseError: `${message}: showing the nominal pose.` };
    }
    // eslint-disable-next-line react-hooks/exhaustive-deps -- choiceKey stands for choice (a new object on every render)
  }, [vm, drawn, choiceKey]);

  // ---- pose description
  const worst = worstTrials ?? [];
  const pickIndex = (() => {
    if (choice.kind !== "trial") return -1;
    const byMetric = worst.findIndex((w) => w.trialIndex === choice.index && w.metric === pickedMetric);
    return byMetric >= 0 ? byMetric : worst.findIndex((w) => w.trialIndex === choice.index);
  })();
  const pick = pickIndex >= 0 ? worst[pickIndex] : null;
  const recomputed = (() => {
    if (!pick || !set || poseError) return null;
    const k = set.metricIds.indexOf(pick.metric);
    return k >= 0 ? set.metrics[k] : null;
  })();
  const mismatch = !!pick && recomputed !== null && Math.abs(recomputed - pick.value) > 1e-6 * Math.max(1, Math.abs(pick.value));
  const poseLabel =
    poseError || choice.kind === "nominal"
      ? "Nominal pose (design intent)"
      : choice.kind === "mean"
        ? "Tolerance means (systematic shifts only)"
        : pick
          ? `Trial ${choice.index}: worst ${pick.metric}, ${formatNumberUnit(pick.value, pick.unit)}`
          : `Trial ${choice.index}`;

  const selectValue = choice.kind === "trial" ? (pickIndex >= 0 ? `worst:${pickIndex}` : "trial") : choice.kind;
  const onPoseSelect = (v: string) => {
    if (v === "nominal" || v === "mean") {
      setMeanPose(v === "mean");
      setPickedMetric(null);
      setTrial(null);
    } else if (v === "trial") {
      setMeanPose(false);
      setPickedMetric(null);
      setTrial(trial ?? 0);
    } else if (v.startsWith("worst:")) {
      const w = worst[Number(v.slice(6))];
      if (!w) return;
      setMeanPose(false);
      setPickedMetric(w.metric);
      setTrial(w.trialIndex);
    }
  };

  // ---- trial index field (text while typing, committed on Enter or blur)
  const [trialText, setTrialText] = useState(trial != null ? String(trial) : "");
  useEffect(() => {
    setTrialText(trial != null ? String(trial) : "");
  }, [trial]);
  const trials = vm?.hasStudy ? vm.plan.trials : 0;
  const commitTrial = (text: string) => {
    const n = Number(text);
    if (text.trim() === "" || !Number.isInteger(n) || n < 0) {
      setTrialText(trial != null ? String(trial) : "");
      return;
    }
    setMeanPose(false);
    setPickedMetric(null);
    setTrial(Math.min(n, Math.max(0, trials - 1)));
  };

  return {
    drawn,
    stackIssue,
    vm,
    choice,
    choiceKey,
    set,
    poseError,
    trial,
    trials,
    worst,
    pick,
    recomputed,
    mismatch,
    poseLabel,
    selectValue,
    onPoseSelect,
    trialText,
    setTrialText,
    commitTrial,
  };
}

export type ViewerPose = ReturnType<typeof useViewerPose>;
