import { defineConfig } from "drizzle-kit";

export default defineConfig({
  dialect: "postgresql",
  schema: "./backend/db/schema/index.ts",
  out: "./drizzle",
});
