import { and, asc, eq, inArray } from "drizzle-orm";
import type { z } from "zod";
import type { CreateContactSchema, CreateSupplierSchema, Supplier, UpdateSupplierSchema } from "@shared/schemas/api";
import type { Database } from "../db/client";
import { supplierContacts, suppliers } from "../db/schema";
import { conflict, found } from "../lib/errors";

const isUniqueViolation = (e: unknown) => {
  const err = e as { code?: string; cause?: { code?: string } };
  return err?.code === "23505" || err?.cause?.code === "23505";
};

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
  return rows.map((s) => ({
    id: s.id,
    name: s.name,
    kind: s.kind,
    createdAt: s.createdAt.toISOString(),
    contacts: contacts.filter((c) => c.supplierId === s.id).map((c) => ({ id: c.id, name: c.name, email: c.email })),
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

export async function updateSupplier(db: Database, workspaceId: string, id: string, input: z.infer<typeof UpdateSupplierSchema>) {
  await getSupplier(db, workspaceId, id);
  try {
    await db
      .update(suppliers)
      .set(input)
      .where(and(eq(suppliers.workspaceId, workspaceId), eq(suppliers.id, id)));
  } catch (e) {
    if (isUniqueViolation(e)) throw conflict(`A supplier named “${input.name}” already exists.`, "duplicate_supplier");
    throw e;
  }
  return getSupplier(db, workspaceId, id);
}

export async function deleteSupplier(db: Database, workspaceId: string, id: string) {
  await getSupplier(db, workspaceId, id);
  await db.delete(suppliers).where(and(eq(suppliers.workspaceId, workspaceId), eq(suppliers.id, id)));
}

export async function addContact(db: Database, workspaceId: string, supplierId: string, input: z.infer<typeof CreateContactSchema>) {
  await getSupplier(db, workspaceId, supplierId);
  try {
    const [row] = await db.insert(supplierContacts).values({ supplierId, name: input.name, email: input.email }).returning();
    return { id: row.id, name: row.name, email: row.email };
  } catch (e) {
    if (isUniqueViolation(e)) throw conflict(`${input.email} is already a contact of this supplier.`, "duplicate_contact");
    throw e;
  }
}

export async function removeContact(db: Database, workspaceId: string, supplierId: string, contactId: string) {
  await getSupplier(db, workspaceId, supplierId);
  const deleted = await db
    .delete(supplierContacts)
    .where(and(eq(supplierContacts.supplierId, supplierId), eq(supplierContacts.id, contactId)))
    .returning({ id: supplierContacts.id });
  found(deleted[0], "The contact");
}
