import { z } from "zod";

/** The environment, parsed once at start-up; a bad value stops the server with a clear message. */
const EnvSchema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("production"),
  PORT: z.coerce.number().int().min(0).max(65535).default(3000),
  HOST: z.string().default("0.0.0.0"),
  DATA_DIR: z.string().min(1).default("./data"),
  /** Reserved for a team's PostgreSQL server (DESIGN.md, Scale). Not wired yet: PGlite is used. */
  DATABASE_URL: z.string().url().optional(),
  /** Public address of the app, used in links sent by e-mail. */
  BASE_URL: z.string().url().optional(),
  BETTER_AUTH_SECRET: z.string().min(32, "BETTER_AUTH_SECRET must be at least 32 characters").optional(),
  /** Sign-in attempts allowed per client address per minute. */
  SIGN_IN_PER_MINUTE: z.coerce.number().int().min(1).max(10000).default(10),
  /** Worker threads per study; default: one per core. */
  STUDY_THREADS: z.coerce.number().int().min(1).max(64).optional(),
  /** Seed the demo workspace when the database has no workspace yet. */
  SEED_DEMO: z
    .enum(["true", "false"])
    .default("true")
    .transform((v) => v === "true"),
});

export type Env = z.infer<typeof EnvSchema>;

export function parseEnv(source: NodeJS.ProcessEnv = process.env): Env {
  const result = EnvSchema.safeParse(source);
  if (!result.success) {
    const lines = result.error.issues.map((i) => `  ${i.path.join(".")}: ${i.message}`);
    throw new Error(`Invalid environment:\n${lines.join("\n")}`);
  }
  return result.data;
}
