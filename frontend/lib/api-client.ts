import type * as z from "zod";
import { ApiErrorSchema, versionTag, type FieldError } from "@shared/schemas/common";

export type { FieldError };

/**
 * Every failed call to our API becomes one of these, so screens can branch on the
 * status or the code and put `fields` next to the inputs they belong to.
 */
export class ApiError extends Error {
  readonly status: number;
  readonly code: string;
  readonly fields: FieldError[];
  /** On a 409 `conflict`: the record's current version (someone else changed it meanwhile). */
  readonly version: number | undefined;

  constructor(status: number, code: string, message: string, fields: FieldError[] = [], version?: number) {
    super(message);
    this.name = "ApiError";
    this.status = status;
    this.code = code;
    this.fields = fields;
    this.version = version;
  }

  /** The message for one form field, if the server sent one. */
  fieldMessage(path: string): string | undefined {
    return this.fields.find((f) => f.path === path)?.message;
  }
}

export function isApiError(error: unknown): error is ApiError {
  return error instanceof ApiError;
}

const FALLBACK_MESSAGES: Record<number, string> = {
  400: "The request was not accepted.",
  401: "Your session has ended. Sign in again.",
  403: "Your role does not allow this.",
  404: "This item does not exist or was removed.",
  409: "This conflicts with the current state. Reload and try again.",
  428: "The change did not say which version it was made on. Reload and try again.",
  429: "Too many attempts. Wait a minute and try again.",
};

async function toApiError(response: Response): Promise<ApiError> {
  let body: unknown = undefined;
  try {
    body = await response.json();
  } catch {
    // Not JSON (a proxy error page, an empty body): fall back to the status text below.
  }
  const parsed = ApiErrorSchema.safeParse(body);
  if (parsed.success) {
    const { code, message, fields, version } = parsed.data.error;
    return new ApiError(response.status, code, message, fields ?? [], version);
  }
  const message =
    FALLBACK_MESSAGES[response.status] ??
    (response.status >= 500 ? "The server ran into a problem. Try again shortly." : `Request failed (${response.status}).`);
  return new ApiError(response.status, `http_${response.status}`, message);
}

type RequestOptions = {
  method?: "GET" | "POST" | "PATCH" | "PUT" | "DELETE";
  body?: unknown;
  signal?: AbortSignal;
  /** The version of a shared record this change was made on, sent as If-Match (backend/lib/versions.ts). */
  version?: number;
};

/**
 * Calls our JSON API and parses the answer with the shared response schema, so a
 * field the contract does not declare never reaches a component.
 * Pass `null` as the schema for answers without a body (204).
 */
export async function apiRequest<S extends z.ZodType>(path: string, schema: S, options?: RequestOptions): Promise<z.infer<S>>;
export async function apiRequest(path: string, schema: null, options?: RequestOptions): Promise<void>;
export async function apiRequest(path: string, schema: z.ZodType | null, options: RequestOptions = {}): Promise<unknown> {
  const { method = "GET", body, signal, version } = options;
  // A FormData body (a file upload) goes as multipart; the browser writes its boundary.
  const form = typeof FormData !== "undefined" && body instanceof FormData;
  let response: Response;
  try {
    response = await fetch(path, {
      method,
      signal,
      credentials: "same-origin",
      headers: {
        Accept: "application/json",
        ...(body !== undefined && !form ? { "Content-Type": "application/json" } : {}),
        ...(version !== undefined ? { "If-Match": versionTag(version) } : {}),
      },
      body: form ? (body as FormData) : body !== undefined ? JSON.stringify(body) : undefined,
    });
  } catch (cause) {
    if (cause instanceof DOMException && cause.name === "AbortError") throw cause;
    throw new ApiError(0, "network", "The server cannot be reached. Check the connection and try again.");
  }

  if (!response.ok) throw await toApiError(response);
  if (schema === null || response.status === 204) return undefined;

  let json: unknown;
  try {
    json = await response.json();
  } catch {
    throw new ApiError(response.status, "bad_response", "The server sent an answer that could not be read.");
  }
  const parsed = schema.safeParse(json);
  if (!parsed.success) {
    throw new ApiError(response.status, "bad_response", "The server sent an answer in an unexpected shape.");
  }
  return parsed.data;
}

export const api = {
  get: <S extends z.ZodType>(path: string, schema: S, signal?: AbortSignal) => apiRequest(path, schema, { signal }),
  /** `version`: the version of the shared record the change was made on (If-Match). */
  post: <S extends z.ZodType>(path: string, body: unknown, schema: S, version?: number) =>
    apiRequest(path, schema, { method: "POST", body, version }),
  patch: <S extends z.ZodType>(path: string, body: unknown, schema: S, version?: number) =>
    apiRequest(path, schema, { method: "PATCH", body, version }),
  put: <S extends z.ZodType>(path: string, body: unknown, schema: S) => apiRequest(path, schema, { method: "PUT", body }),
  /** `version`: the version of the shared record being deleted (If-Match); records without one take none. */
  delete: (path: string, version?: number) => apiRequest(path, null, { method: "DELETE", version }),
};

/** Builds `/api/x?q=..` leaving out empty values. */
export function withQuery(path: string, params: Record<string, string | undefined>): string {
  const search = new URLSearchParams();
  for (const [key, value] of Object.entries(params)) {
    if (value !== undefined && value !== "") search.set(key, value);
  }
  const qs = search.toString();
  return qs ? `${path}?${qs}` : path;
}
