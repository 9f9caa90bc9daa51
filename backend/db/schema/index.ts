/**
 * The database schema, one file per part of the product: plural tables, camelCase keys over
 * snake_case columns. better-auth's four tables are in auth.ts; the rest are Orthostack's own.
 */
export * from "./auth";
export * from "./workspace";
export * from "./studies";
export * from "./reports";
export * from "./datasets";
