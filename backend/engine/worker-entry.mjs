// Plain-JS entry of the engine worker thread: it registers tsx in this thread, then
// loads the TypeScript worker. Loader flags of the parent (tsx, vitest) do not reach
// worker threads on every Node 20 release; registering here works under all of them.
import { register } from "tsx/esm/api";

register();
await import("./worker.ts");
