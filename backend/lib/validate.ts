import type { Request } from "express";
import type * as z from "zod";
import { badRequest, zodFields } from "./errors";

type Part = "body" | "params" | "query";

/** Parses one part of a request with its zod schema; a failure is a 400 naming each field. */
export function parse<S extends z.ZodType>(schema: S, req: Request, part: Part = "body"): z.infer<S> {
  const value = part === "body" ? (req.body ?? {}) : part === "params" ? req.params : req.query;
  const result = schema.safeParse(value);
  if (!result.success) {
    const where = part === "body" ? "request body" : part === "params" ? "address" : "query string";
    throw badRequest(`The ${where} is not valid.`, zodFields(result.error.issues));
  }
  return result.data;
}
