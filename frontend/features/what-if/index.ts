/** What other parts of the client use of what-if runs: the three panels of the what-if page. */
export { SweepPanel } from "./components/sweep-panel";
export { AllocationPanel } from "./components/allocation-panel";
export { CompassMapPanel } from "./components/compass-map-panel";
