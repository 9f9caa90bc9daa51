import type { AppDeps } from "./deps";

type Hook = { start: (deps: AppDeps) => Promise<void> | void; stop?: () => Promise<void> | void };

/**
 * Work that starts with the server and stops with it (the study queue, the local mail catcher).
 * Features register here so `server.ts` does not grow with each of them.
 */
class StartHooks {
  private hooks: Hook[] = [];
  add(hook: Hook) {
    this.hooks.push(hook);
  }
  async run(deps: AppDeps) {
    for (const h of this.hooks) await h.start(deps);
  }
  async stop() {
    for (const h of [...this.hooks].reverse()) await h.stop?.();
  }
}

export const startHooks = new StartHooks();
