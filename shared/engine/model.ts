/**
 * The stack model's public surface, kept so callers import one module: compiling a stack
 * (compile.ts), one trial (trial.ts) and poses (poses.ts) live in their own files.
 */
export * from "./compile";
export * from "./trial";
export * from "./poses";
