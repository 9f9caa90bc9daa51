/** Column helpers shared by the tables. */
import { customType, integer, timestamp } from "drizzle-orm/pg-core";

/**
 * Edit counter of a record people share: every change adds one, and a change is accepted only
 * from a client that saw the current value (If-Match / body version; backend/lib/versions.ts).
 */
export const version = () => integer("version").notNull().default(1);

export const timestamps = {
  createdAt: timestamp("created_at", { withTimezone: true }).defaultNow().notNull(),
  updatedAt: timestamp("updated_at", { withTimezone: true })
    .defaultNow()
    .$onUpdate(() => new Date())
    .notNull(),
};

/** Binary file contents (report files, caught mail), kept in the database beside their records. */
export const bytea = customType<{ data: Buffer; driverData: Uint8Array }>({
  dataType: () => "bytea",
  toDriver: (v) => v,
  fromDriver: (v) => Buffer.from(v),
});
