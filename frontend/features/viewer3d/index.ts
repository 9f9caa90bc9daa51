/**
 * The 3D view. Import it only lazily (`lazy(() => import("@frontend/features/viewer3d"))`):
 * three and drei are about 1.5 MB and stay out of the pages that do not show it.
 */
export { default, type StackViewerProps, type WorstTrialPick } from "./components/stack-viewer";
