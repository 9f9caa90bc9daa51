import { eq, sql } from "drizzle-orm";
import type { Auth } from "./auth";
import type { Database } from "./db/client";
import { members, projects, supplierContacts, suppliers, users, workspaces } from "./db/schema";
import { createAccount } from "./lib/accounts";
import { recordActivity } from "./services/activity";

/** Invented demo scenario: a small wearables maker and its module assembler. */
export const DEMO_PASSWORD = "orthostack-demo";
export const DEMO_WORKSPACE = "Kestrel Wearables";
export const DEMO_SUPPLIER = "Larkfield Assembly";
export const DEMO_PROJECT = "Ridgeline trail watch: 9-axis sensor module";

export const DEMO_USERS = [
  { email: "admin@example.com", name: "Ada Okafor", role: "admin" },
  { email: "engineer@example.com", name: "Ezra Lindqvist", role: "engineer" },
  { email: "reviewer@example.com", name: "Rana Haddad", role: "reviewer" },
  { email: "supplier@example.com", name: "Sam Whitcombe", role: "supplier" },
] as const;

/** The demo workspace as made by `seedDemo`, handed to each seed step. */
export type SeedContext = { workspaceId: string; projectId: string; userIds: Record<string, string>; supplierId: string };
/** Demo data of one feature (stack revisions, studies, data sets), run in order after the workspace exists. */
export type SeedStep = (db: Database, ctx: SeedContext) => Promise<void>;

/**
 * Creates the demo workspace when the database holds no workspace at all. Running it again
 * changes nothing; a database with a real workspace is never touched. `steps` add each
 * feature's demo data (`DEMO_SEED_STEPS` of `demo/steps.ts`).
 */
export async function seedDemo(db: Database, auth: Auth, steps: readonly SeedStep[]): Promise<"seeded" | "skipped"> {
  const [{ n }] = await db.select({ n: sql<number>`count(*)::int` }).from(workspaces);
  if (n > 0) return "skipped";

  const userIds: Record<string, string> = {};
  for (const u of DEMO_USERS) {
    const [existing] = await db.select({ id: users.id }).from(users).where(eq(users.email, u.email));
    if (existing) {
      userIds[u.role] = existing.id;
      continue;
    }
    userIds[u.role] = (await createAccount(auth, { email: u.email, password: DEMO_PASSWORD, name: u.name })).id;
  }

  const ctx = await db.transaction(async (tx) => {
    const [ws] = await tx.insert(workspaces).values({ name: DEMO_WORKSPACE, isDemo: true }).returning();
    const [larkfield] = await tx.insert(suppliers).values({ workspaceId: ws.id, name: DEMO_SUPPLIER, kind: "assembly" }).returning();
    await tx.insert(suppliers).values([
      { workspaceId: ws.id, name: "Fenmoor Substrates", kind: "substrate" },
      { workspaceId: ws.id, name: "Quillon Boardworks", kind: "board" },
    ]);
    await tx.insert(supplierContacts).values({ supplierId: larkfield.id, name: "Sam Whitcombe", email: "supplier@example.com" });
    for (const u of DEMO_USERS) {
      await tx.insert(members).values({
        workspaceId: ws.id,
        userId: userIds[u.role],
        role: u.role,
        supplierId: u.role === "supplier" ? larkfield.id : null,
      });
    }
    const [project] = await tx
      .insert(projects)
      .values({
        workspaceId: ws.id,
        name: DEMO_PROJECT,
        description:
          "Gyroscope, accelerometer and magnetometer stacked on the sensor ASIC in a 3 × 3 mm LGA, on the watch's main board. Heading budget ±2° at 99 % of units.",
        ownerId: userIds.engineer,
      })
      .returning();
    await recordActivity(tx, {
      workspaceId: ws.id,
      projectId: project.id,
      actorId: userIds.engineer,
      action: "project.created",
      summary: `created the project “${DEMO_PROJECT}”`,
    });
    return { workspaceId: ws.id, projectId: project.id, userIds, supplierId: larkfield.id };
  });

  for (const step of steps) await step(db, ctx);
  return "seeded";
}
