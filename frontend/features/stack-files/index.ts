/**
 * Stack files in and out of the app: reading an imported file, naming and writing an exported
 * one, the starter stack of a new project, and the dialog listing an import's problems. Used
 * by the revisions panel (new revision from a file) and the stack editor (import, export).
 */
export { ImportIssuesDialog } from "./components/import-issues-dialog";
export { starterStack } from "./lib/starter-stack";
export {
  MAX_IMPORT_BYTES,
  readStackFileText,
  stackFileName,
  stackFileText,
  withElementIds,
  type ImportIssue,
  type ImportResult,
} from "./lib/stack-file-io";
