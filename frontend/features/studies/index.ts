/** What other features use of studies: study and revision queries, starting a study, the chart styling. */
export { useCreateStudy } from "./api/create-study";
export { projectRevisionsQueryOptions, useProjectRevisions } from "./api/get-project-revisions";
export { revisionQueryOptions, useRevision } from "./api/get-revision";
export { studiesQueryOptions, useStudies } from "./api/get-studies";
export { studyQueryOptions, useStudy, type StudyDetail } from "./api/get-study";
export {
  axisLabel,
  axisLine,
  axisTick,
  FAIL,
  gridProps,
  INK,
  LINE,
  PAPER,
  PASS,
  SENSOR_COLOUR,
  SERIES_A,
  SERIES_B,
  tooltipStyle,
} from "./components/chart-theme";
