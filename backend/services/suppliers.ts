import { and, asc, eq, inArray } from "drizzle-orm";
import type * as z from "zod";
import type { CreateContactSchema, CreateSupplierSchema, Supplier, UpdateSupplierSchema } from "@shared/schemas/api";
import type { Database } from "../db/client";
import { members, supplierContacts, suppliers, users } from "../db/schema";
import { conflict, found, isUniqueViolation } from "../lib/errors";
import { assertVersion, deleteVersioned, requireVersion, writeVersioned } from "../lib/versions";

export async function listSuppliers(db: Database, workspaceId: string, onlyId?: string | null): Promise<Supplier[]> {
  const rows = await db
    .select()
    .from(suppliers)
    .where(and(eq(suppliers.workspaceId, workspaceId), onlyId ? eq(suppliers.id, onlyId) : undefined))
    .orderBy(asc(suppliers.name));
  const ids = rows.map((r) => r.id);
  const contacts = ids.length
    ? await db.select().from(supplierContacts).where(inArray(supplierContacts.supplierId, ids)).orderBy(asc(supplierContacts.name))
    : [];
  // which contacts can sign in: a supplier member of this workspace, of the same company, with the same address
  const accounts = ids.length
    ? await db
        .select({ supplierId: members.supplierId, email: users.email })
        .from(members)
        .innerJoin(users, eq(users.id, members.userId))
        .where(and(eq(members.workspaceId, workspaceId), inArray(members.supplierId, ids)))
    : [];
  const withAccount = new Set(accounts.map((a) => `${a.supplierId}|${a.email.toLowerCase()}`));
  return rows.map((s) => ({
    id: s.id,
    name: s.name,
    kind: s.kind,
    createdAt: s.createdAt.toISOString(),
    version: s.version,
    contacts: contacts
      .filter((c) => c.supplierId === s.id)
      .map((c) => ({ id: c.id, name: c.name, email: c.email, hasAccount: withAccount.has(`${s.id}|${c.email.toLowerCase()}`) })),
  }));
}

export async function getSupplier(db: Database, workspaceId: string, id: string): Promise<Supplier> {
  const [s] = await listSuppliers(db, workspaceId, id);
  return found(s, "The supplier");
}

export async function createSupplier(db: Database, workspaceId: string, input: z.infer<typeof CreateSupplierSchema>) {
  try {
    const [row] = await db.insert(suppliers).values({ workspaceId, name: input.name, kind: input.kind }).returning();
    return getSupplier(db, workspaceId, row.id);
  } catch (e) {
    if (isUniqueViolation(e)) throw conflict(`A supplier named “${input.name}” already exists.`, "duplicate_supplier");
    throw e;
  }
}

export async function updateSupplier(
  db: Database,
  workspaceId: string,
  id: string,
  { version: _sent, ...input }: z.infer<typeof UpdateSupplierSchema>,
  sent: number | undefined,
) {
  const before = await getSupplier(db, workspaceId, id);
  const expected = requireVersion(`The supplier “${before.name}”`, before.version, sent);
  try {
    await db.transaction((tx) => writeVersioned(tx, suppliers, id, expected, `The supplier “${before.name}”`, input));
  } catch (e) {
    if (isUniqueViolation(e)) throw conflict(`A supplier named “${input.name}” already exists.`, "duplicate_supplier");
    throw e;
  }
  return getSupplier(db, workspaceId, id);
}

/** Deletes a supplier company (and its contacts) on the version the caller last read (`sent`). */
export async function deleteSupplier(db: Database, workspaceId: string, id: string, sent: number | undefined) {
  const s = await getSupplier(db, workspaceId, id);
  const what = `The supplier “${s.name}”`;
  const expected = requireVersion(what, s.version, sent);
  await db.transaction((tx) => deleteVersioned(tx, suppliers, id, expected, what, { where: eq(suppliers.workspaceId, workspaceId) }));
}

/**
 * A contact belongs to its supplier's record: adding or removing one counts as a change of it.
 * Adding is checked against `expected` when the client sends it (an added contact overwrites
 * nothing); removing requires the supplier's version, like every deletion.
 */
export async function addContact(
  db: Database,
  workspaceId: string,
  supplierId: string,
  input: z.infer<typeof CreateContactSchema>,
  expected?: number,
) {
  const s = await getSupplier(db, workspaceId, supplierId);
  assertVersion(`The supplier “${s.name}”`, s.version, expected);
  try {
    const row = await db.transaction(async (tx) => {
      const [c] = await tx.insert(supplierContacts).values({ supplierId, name: input.name, email: input.email }).returning();
      await writeVersioned(tx, suppliers, supplierId, expected, `The supplier “${s.name}”`);
      return c;
    });
    // a supplier user of this company may already sign in with this address
    const [account] = await db
      .select({ id: users.id })
      .from(members)
      .innerJoin(users, eq(users.id, members.userId))
      .where(and(eq(members.workspaceId, workspaceId), eq(members.supplierId, supplierId), eq(users.email, row.email.toLowerCase())));
    return { id: row.id, name: row.name, email: row.email, hasAccount: account !== undefined };
  } catch (e) {
    if (isUniqueViolation(e)) throw conflict(`${input.email} is already a contact of this supplier.`, "duplicate_contact");
    throw e;
  }
}

export async function removeContact(db: Database, workspaceId: string, supplierId: string, contactId: string, sent: number | undefined) {
  const s = await getSupplier(db, workspaceId, supplierId);
  const expected = requireVersion(`The supplier “${s.name}”`, s.version, sent);
  await db.transaction(async (tx) => {
    const deleted = await tx
      .delete(supplierContacts)
      .where(and(eq(supplierContacts.supplierId, supplierId), eq(supplierContacts.id, contactId)))
      .returning({ id: supplierContacts.id });
    found(deleted[0], "The contact");
    await writeVersioned(tx, suppliers, supplierId, expected, `The supplier “${s.name}”`);
  });
}
