/** What other features use of projects: the query keys their mutations invalidate. */
export { projectKeys } from "./api/keys";
