/** The live estimate lives in shared/engine: the server judges a submitted draft with the same figures. */
export * from "@shared/engine/live-estimate";
export * from "@shared/engine/live-study";
