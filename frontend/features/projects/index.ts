/** What other features use of projects: the query keys their mutations invalidate. */
export { projectKeys } from "./api/keys";
/** The read-only notice of an archived project, for the pages under it. */
export { ArchivedProjectNotice, isArchived } from "./components/archived-notice";
