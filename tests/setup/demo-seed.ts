// The demo workspace as every seeded test app starts with it, written once per run into a
// database snapshot (tests/setup/pglite-snapshots.ts, postgres-global.ts) instead of once per app.
import { createAuth } from "@backend/auth";
import type { Database } from "@backend/db/client";
import { DEMO_SEED_STEPS } from "@backend/demo/steps";
import { seedDemo } from "@backend/seed";

export const TEST_BASE_URL = "http://localhost:3999";
export const TEST_AUTH_SECRET = "test-secret-test-secret-test-secret-123";

/** Seeds the demo workspace (users, stack, its queued study, data sets) as `npm start` does. */
export async function seedDemoInto(db: Database): Promise<void> {
  const auth = createAuth({ db, baseURL: TEST_BASE_URL, secret: TEST_AUTH_SECRET, signInPerMinute: 1000 });
  const outcome = await seedDemo(db, auth, DEMO_SEED_STEPS);
  if (outcome !== "seeded") throw new Error("the snapshot database was not empty");
}
