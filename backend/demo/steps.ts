import type { SeedStep } from "../seed";
import { seedDemoDatasets } from "./seed-datasets";
import { seedDemoStack } from "./seed-stack";

/** The demo's data after the workspace, in order: the stack (and its queued study), then the measured data set. */
export const DEMO_SEED_STEPS: readonly SeedStep[] = [seedDemoStack, seedDemoDatasets];
