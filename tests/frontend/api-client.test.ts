import { afterEach, describe, expect, it, vi } from "vitest";
import * as z from "zod";
import { api, ApiError, apiRequest, withQuery } from "@frontend/lib/api-client";
import { jsonResponse, mockFetch } from "./helpers";

const ThingSchema = z.object({ id: z.string(), size: z.number() });

afterEach(() => vi.restoreAllMocks());

async function caught(promise: Promise<unknown>): Promise<ApiError> {
  try {
    await promise;
  } catch (error) {
    if (error instanceof ApiError) return error;
    throw error;
  }
  throw new Error("expected the call to fail");
}

describe("apiRequest", () => {
  it("parses a successful answer with the given schema and drops undeclared fields", async () => {
    mockFetch(() => jsonResponse(200, { id: "a", size: 3, secret: "leak" }));
    await expect(apiRequest("/api/things/a", ThingSchema)).resolves.toEqual({ id: "a", size: 3 });
  });

  it("maps the error body to status, code, message and field errors", async () => {
    mockFetch(() =>
      jsonResponse(400, {
        error: {
          code: "invalid_input",
          message: "The request body is not valid.",
          fields: [
            { path: "name", message: "Project name must not be empty" },
            { path: "description", message: "description must be at most 2000 characters" },
          ],
        },
      }),
    );
    const error = await caught(apiRequest("/api/projects", ThingSchema, { method: "POST", body: { name: "" } }));
    expect(error.status).toBe(400);
    expect(error.code).toBe("invalid_input");
    expect(error.message).toBe("The request body is not valid.");
    expect(error.fields).toHaveLength(2);
    expect(error.fieldMessage("name")).toBe("Project name must not be empty");
    expect(error.fieldMessage("other")).toBeUndefined();
  });

  it("keeps 401 and 403 apart so screens can tell signed-out from not-allowed", async () => {
    mockFetch(({ url }) =>
      url === "/api/me"
        ? jsonResponse(401, { error: { code: "unauthorized", message: "Sign in first." } })
        : jsonResponse(403, { error: { code: "forbidden", message: "Your role may not do this." } }),
    );
    const signedOut = await caught(apiRequest("/api/me", ThingSchema));
    const refused = await caught(apiRequest("/api/projects", ThingSchema));
    expect([signedOut.status, signedOut.code, signedOut.fields]).toEqual([401, "unauthorized", []]);
    expect([refused.status, refused.code]).toEqual([403, "forbidden"]);
  });

  it("gives a readable message when the body is not our error shape (a proxy page, say)", async () => {
    mockFetch(() => new Response("<html>Bad gateway</html>", { status: 502, headers: { "Content-Type": "text/html" } }));
    const error = await caught(apiRequest("/api/projects", ThingSchema));
    expect(error.status).toBe(502);
    expect(error.code).toBe("http_502");
    expect(error.message).toMatch(/server ran into a problem/i);
  });

  it("refuses an answer that does not match the contract", async () => {
    mockFetch(() => jsonResponse(200, { id: "a", size: "three" }));
    const error = await caught(apiRequest("/api/things/a", ThingSchema));
    expect(error.code).toBe("bad_response");
  });

  it("turns a network failure into status 0", async () => {
    vi.spyOn(globalThis, "fetch").mockRejectedValue(new TypeError("Failed to fetch"));
    const error = await caught(apiRequest("/api/things", ThingSchema));
    expect(error.status).toBe(0);
    expect(error.code).toBe("network");
  });

  it("sends JSON bodies and accepts 204 without a body", async () => {
    const fetchSpy = mockFetch(() => new Response(null, { status: 204 }));
    await expect(apiRequest("/api/projects/x", null, { method: "DELETE" })).resolves.toBeUndefined();
    await apiRequest("/api/projects", null, { method: "POST", body: { name: "Rev C" } });
    const [, init] = fetchSpy.mock.calls[1];
    expect(init?.method).toBe("POST");
    expect(init?.body).toBe('{"name":"Rev C"}');
    expect(new Headers(init?.headers).get("Content-Type")).toBe("application/json");
  });

  it("names the version a deletion was made on as If-Match, and none for a record without one", async () => {
    const fetchSpy = mockFetch(() => new Response(null, { status: 204 }));
    await api.delete("/api/datasets/x", 3);
    await api.delete("/api/invitations/y");
    expect(new Headers(fetchSpy.mock.calls[0][1]?.headers).get("If-Match")).toBe('"3"');
    expect(new Headers(fetchSpy.mock.calls[1][1]?.headers).get("If-Match")).toBeNull();
  });
});

describe("withQuery", () => {
  it("leaves out empty values and encodes the rest", () => {
    expect(withQuery("/api/projects", { q: "" })).toBe("/api/projects");
    expect(withQuery("/api/projects", { q: undefined })).toBe("/api/projects");
    expect(withQuery("/api/projects", { q: "rev C & D" })).toBe("/api/projects?q=rev+C+%26+D");
  });
});
