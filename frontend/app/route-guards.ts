import type { QueryClient } from "@tanstack/react-query";
import { data, redirect } from "react-router";
import type { Me } from "@shared/schemas/api";
import { meQueryOptions } from "@frontend/features/auth/api/get-me";
import { isApiError } from "@frontend/lib/api-client";
import { can, type Right } from "@frontend/lib/permissions";

export function signInPath(request: Request): string {
  const url = new URL(request.url);
  const next = url.pathname + url.search;
  return next === "/" ? "/sign-in" : `/sign-in?next=${encodeURIComponent(next)}`;
}

/**
 * The signed-in member, or a redirect to the sign-in page. Loaders of one navigation
 * run in parallel; each calls this and TanStack Query makes it one request.
 */
export async function requireMe(queryClient: QueryClient, request: Request): Promise<Me> {
  try {
    return await queryClient.ensureQueryData(meQueryOptions());
  } catch (error) {
    if (isApiError(error) && error.status === 401) throw redirect(signInPath(request));
    throw error;
  }
}

/** As requireMe, and a 403 page when the role may not see this screen. */
export async function requirePermission(queryClient: QueryClient, request: Request, permission: Right): Promise<Me> {
  const me = await requireMe(queryClient, request);
  if (!can(me.role, permission)) {
    throw data({ message: "Your role does not give access to this page." }, { status: 403 });
  }
  return me;
}

/** Only follow `next` within this site, so a crafted link cannot send someone elsewhere. */
export function safeNext(next: string | null): string | null {
  if (!next || !next.startsWith("/") || next.startsWith("//") || next.startsWith("/sign-in")) return null;
  return next;
}
