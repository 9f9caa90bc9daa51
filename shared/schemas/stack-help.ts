/**
 * Help for entering a stack: typical tolerances, stack templates and the geometry warnings
 * a revision carries (`GET /api/typical-tolerances`, `GET /api/stack-templates`).
 */
import * as z from "zod";
import { TYPICAL_APPLIES, TYPICAL_KINDS } from "../typical-tolerances";
import { StackFileObjectSchema } from "./stack-file";
import { RequirementSchema } from "./study-file";

export const TypicalToleranceSchema = z.object({
  kind: z.enum(TYPICAL_KINDS),
  appliesTo: z.enum(TYPICAL_APPLIES),
  label: z.string(),
  dist: z.enum(["normal", "uniform", "triangular"]),
  tol: z.number().positive(),
  unit: z.enum(["um", "deg"]),
  note: z.string().min(1),
  basis: z.string().min(1),
});
export const TypicalTolerancesResponseSchema = z.object({ typical: z.array(TypicalToleranceSchema) });

export const StackTemplateSchema = z.object({
  id: z.string(),
  name: z.string(),
  description: z.string(),
  /** a stack file (the tests check each template with the stack file's own validator) */
  stack: StackFileObjectSchema,
  requirements: z.array(RequirementSchema),
});
export const StackTemplatesResponseSchema = z.object({ templates: z.array(StackTemplateSchema) });
export type StackTemplateEntry = z.infer<typeof StackTemplateSchema>;

export const GeometryWarningSchema = z.object({ path: z.string(), message: z.string() });
