/**
 * The server checks its own answers against their schemas where it is told to (development,
 * tests): a mismatch is a 500 naming the field, never a silent wrong answer. backend/lib/respond.ts
 */
import express from "express";
import type { AddressInfo } from "node:net";
import { describe, expect, it } from "vitest";
import * as z from "zod";
import { errorHandler } from "@backend/lib/errors";
import { CHECK_RESPONSES, send } from "@backend/lib/respond";

const AnswerSchema = z.object({ id: z.string(), count: z.number().int(), at: z.string() });

async function ask(check: boolean, body: unknown) {
  const logged: unknown[] = [];
  const app = express();
  app.locals[CHECK_RESPONSES] = check;
  app.get("/answer", (_req, res) => send(res, AnswerSchema, body as z.input<typeof AnswerSchema>, 201));
  app.use(errorHandler((err) => logged.push(err)));
  const server = app.listen(0, "127.0.0.1");
  await new Promise((r) => server.once("listening", r));
  try {
    const res = await fetch(`http://127.0.0.1:${(server.address() as AddressInfo).port}/answer?x=1`);
    return { status: res.status, body: await res.json(), logged };
  } finally {
    await new Promise((r) => server.close(r));
  }
}

describe("send: answers checked against their schema", () => {
  it("sends a matching answer as it is, with its status; a date goes as the text JSON makes of it", async () => {
    const r = await ask(true, { id: "a", count: 2, at: new Date("2026-01-02T03:04:05Z") });
    expect(r.status).toBe(201);
    expect(r.body).toEqual({ id: "a", count: 2, at: "2026-01-02T03:04:05.000Z" });
    expect(r.logged).toEqual([]);
  });

  it("turns a mismatch into a logged 500 response_mismatch naming the route and each field", async () => {
    const r = await ask(true, { id: "a", count: 2.5 });
    expect(r.status).toBe(500);
    expect(r.body.error.code).toBe("response_mismatch");
    expect(r.body.error.message).toContain("GET /answer");
    expect(r.body.error.fields.map((f: { path: string }) => f.path).sort()).toEqual(["at", "count"]);
    expect(r.logged).toHaveLength(1);
  });

  it("does not parse at all where checking is off (production)", async () => {
    const r = await ask(false, { id: "a", count: 2.5 });
    expect(r.status).toBe(201);
    expect(r.body).toEqual({ id: "a", count: 2.5 });
  });
});
