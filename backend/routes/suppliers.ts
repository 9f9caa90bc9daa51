import { Router } from "express";
import * as z from "zod";
import {
  CreateContactSchema,
  CreateSupplierSchema,
  IdParamsSchema,
  IdSchema,
  SupplierContactSchema,
  SupplierListSchema,
  SupplierSchema,
  UpdateSupplierSchema,
} from "@shared/schemas/api";
import type { AppDeps } from "../deps";
import { send } from "../lib/respond";
import { parse } from "../lib/validate";
import { sendVersioned, sentVersion } from "../lib/versions";
import { actorOf, allow } from "../middleware/session";
import {
  addContact,
  createSupplier,
  deleteSupplier,
  getSupplier,
  listSuppliers,
  removeContact,
  updateSupplier,
} from "../services/suppliers";

const ContactParamsSchema = z.object({ id: IdSchema, contactId: IdSchema });

export function suppliersRouter({ db }: AppDeps) {
  const r = Router();

  r.get("/suppliers", allow("suppliers.read"), async (req, res) => {
    send(res, SupplierListSchema, { suppliers: await listSuppliers(db, actorOf(req).workspaceId) });
  });

  r.get("/suppliers/:id", allow("suppliers.read"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    sendVersioned(res, SupplierSchema, await getSupplier(db, actorOf(req).workspaceId, id));
  });

  r.post("/suppliers", allow("suppliers.write"), async (req, res) => {
    const input = parse(CreateSupplierSchema, req);
    sendVersioned(res, SupplierSchema, await createSupplier(db, actorOf(req).workspaceId, input), 201);
  });

  r.patch("/suppliers/:id", allow("suppliers.write"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const input = parse(UpdateSupplierSchema, req);
    sendVersioned(res, SupplierSchema, await updateSupplier(db, actorOf(req).workspaceId, id, input, sentVersion(req)));
  });

  r.delete("/suppliers/:id", allow("suppliers.write"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    await deleteSupplier(db, actorOf(req).workspaceId, id, sentVersion(req));
    res.status(204).end();
  });

  r.post("/suppliers/:id/contacts", allow("suppliers.write"), async (req, res) => {
    const { id } = parse(IdParamsSchema, req, "params");
    const input = parse(CreateContactSchema, req);
    send(res, SupplierContactSchema, await addContact(db, actorOf(req).workspaceId, id, input, sentVersion(req)), 201);
  });

  r.delete("/suppliers/:id/contacts/:contactId", allow("suppliers.write"), async (req, res) => {
    const { id, contactId } = parse(ContactParamsSchema, req, "params");
    await removeContact(db, actorOf(req).workspaceId, id, contactId, sentVersion(req));
    res.status(204).end();
  });

  return r;
}
