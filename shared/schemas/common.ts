import { z } from "zod";

/** Roles of a workspace member (DESIGN.md, "People and roles"). */
export const RoleSchema = z.enum(["admin", "engineer", "reviewer", "supplier"]);
export type Role = z.infer<typeof RoleSchema>;

export const IdSchema = z.string().uuid({ message: "must be a valid id" });
export const IdParamsSchema = z.object({ id: IdSchema });

/** The one error shape every API answer uses. */
export const ApiErrorSchema = z.object({
  error: z.object({
    code: z.string(),
    message: z.string(),
    fields: z.array(z.object({ path: z.string(), message: z.string() })).optional(),
  }),
});
export type ApiError = z.infer<typeof ApiErrorSchema>;
