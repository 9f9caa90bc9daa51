import type { Express } from "express";

/** Every "METHOD /api/path" the app registers, read from Express's own router stack. */
export function registeredApiRoutes(app: Express): string[] {
  const out: string[] = [];
  type Layer = { rawPath?: string; route?: { path: string | string[]; methods: Record<string, boolean> }; handle: { stack?: Layer[] } };
  const walk = (stack: Layer[], prefix: string) => {
    for (const layer of stack) {
      if (layer.route) {
        // a route on several paths at once is the app's body guard for the upload routes, not an endpoint
        if (typeof layer.route.path !== "string") continue;
        for (const m of Object.keys(layer.route.methods)) {
          if (m === "_all") continue;
          out.push(`${m.toUpperCase()} ${prefix}${layer.route.path}`);
        }
      } else if (layer.handle.stack) {
        walk(layer.handle.stack, prefix + (layer.rawPath ?? ""));
      }
    }
  };
  walk((app as unknown as { router: { stack: Layer[] } }).router.stack, "");
  return [...new Set(out.filter((r) => r.includes(" /api/") && !r.includes("/api/auth/")))].sort();
}
