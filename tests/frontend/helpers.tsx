import type { ReactNode } from "react";
import { QueryClientProvider } from "@tanstack/react-query";
import { render } from "@testing-library/react";
import { createMemoryRouter, RouterProvider, type RouteObject } from "react-router";
import { vi } from "vitest";
import { createQueryClient } from "@frontend/lib/query-client";

/** A JSON answer as our server would send it. */
export function jsonResponse(status: number, body: unknown): Response {
  return new Response(body === undefined ? null : JSON.stringify(body), {
    status,
    headers: { "Content-Type": "application/json" },
  });
}

/**
 * Replaces fetch for one test; `handler` gets the path, method and parsed body of
 * each call. Returns the spy so a test can check what was (not) sent.
 */
export function mockFetch(
  handler: (call: { url: string; method: string; body: unknown; headers: Headers }) => Response | Promise<Response>,
) {
  return vi.spyOn(globalThis, "fetch").mockImplementation(async (input, init) => {
    const request = input instanceof Request ? input : new Request(new URL(String(input), "http://localhost:3000"), init);
    const url = new URL(request.url);
    const text = await request.clone().text();
    return handler({
      url: url.pathname + url.search,
      method: request.method,
      body: text ? JSON.parse(text) : undefined,
      headers: request.headers,
    });
  });
}

/** Renders `element` at `path` inside a memory router and a fresh query client. */
export function renderWithApp(element: ReactNode, { path = "/", extraRoutes = [] }: { path?: string; extraRoutes?: RouteObject[] } = {}) {
  const queryClient = createQueryClient();
  const router = createMemoryRouter([{ path, element }, ...extraRoutes], { initialEntries: [path] });
  const utils = render(
    <QueryClientProvider client={queryClient}>
      <RouterProvider router={router} />
    </QueryClientProvider>,
  );
  return { ...utils, router, queryClient };
}
