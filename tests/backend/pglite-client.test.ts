import { PGlite, types, type QueryOptions } from "@electric-sql/pglite";
import { afterEach, describe, expect, it } from "vitest";
import { DrizzlePGlite, STATEMENT_CACHE_SIZE } from "@backend/db/pglite-client";

// What drizzle-orm's PGlite driver sends with every query (drizzle-orm/pglite/session.js): the
// stock client given these is the reference the faster client must match.
const asText = (v: string) => v;
const drizzleOptions = (rowMode: "array" | "object"): QueryOptions => ({
  rowMode,
  parsers: {
    [types.TIMESTAMP]: asText,
    [types.TIMESTAMPTZ]: asText,
    [types.INTERVAL]: asText,
    [types.DATE]: asText,
    1231: asText,
    1115: asText,
    1185: asText,
    1187: asText,
    1182: asText,
  },
});

const SCHEMA = `create table things (
  id serial primary key, name text unique not null, at timestamptz, ats timestamptz[], span interval,
  amount numeric, amounts numeric[], doc jsonb, raw bytea, flag boolean, ref uuid, tags text[])`;

const opened: PGlite[] = [];
async function open<T extends PGlite>(make: () => T): Promise<T> {
  const db = make();
  opened.push(db);
  await db.waitReady;
  await db.exec(SCHEMA);
  return db;
}
afterEach(async () => {
  await Promise.all(opened.splice(0).map((db) => db.close()));
});

const rows: [string, unknown[]][] = [
  [
    "insert into things (name, at, ats, span, amount, amounts, doc, raw, flag, ref, tags) values ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11) returning *",
    [
      "first",
      new Date("2026-12-03T20:00:00.123Z"),
      "{2026-01-01 00:00:00+00,2026-02-01 12:30:00+00}",
      "1 day 02:03:04",
      "12.500",
      "{1.5,2.25}",
      JSON.stringify({ axis: "z", tilt: [0.1, -0.2] }),
      new Uint8Array([0, 1, 254, 255]),
      true,
      "3db45284-88b5-447f-9463-4ab7e531c543",
      ["gyro", "magnetometer, 3-axis"],
    ],
  ],
  [
    "insert into things (name, at, ats, span, amount, amounts, doc, raw, flag, ref, tags) values ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11) returning *",
    ["second", null, null, null, null, null, null, null, false, null, []],
  ],
];
const reads: [string, unknown[]][] = [
  ["select * from things where name = $1", ["first"]],
  ["select * from things where name = $1", ["second"]],
  ["select id, name, at, flag from things where flag = $1 or name like $2 order by id", [false, "fi%"]],
  ["select count(*)::int as n, max(at) as latest from things where at > $1", [new Date("2026-01-01T00:00:00Z")]],
  ["select name from things where ref = $1", ["3db45284-88b5-447f-9463-4ab7e531c543"]],
  ["select doc->'tilt' as tilt, raw from things where id = any($1)", [[1, 2]]],
];

describe("DrizzlePGlite (PGlite with drizzle's parsers and named statements)", () => {
  it("answers every query as the stock client does with drizzle's options, the first time and from a prepared statement", async () => {
    const stock = await open(() => new PGlite());
    const fast = await open(() => new DrizzlePGlite(undefined));
    for (const [text, params] of rows) {
      const a = await stock.query(text, params, drizzleOptions("array"));
      const b = await fast.query(text, params, drizzleOptions("array"));
      expect(b.rows).toEqual(a.rows);
      expect(b.fields).toEqual(a.fields);
    }
    for (let round = 0; round < 3; round++) {
      for (const [text, params] of reads) {
        for (const mode of ["array", "object"] as const) {
          const a = await stock.query(text, params, drizzleOptions(mode));
          const b = await fast.query(text, params, drizzleOptions(mode));
          expect(b.rows, `${text} (${mode}, round ${round})`).toEqual(a.rows);
          expect(b.fields).toEqual(a.fields);
          expect(b.affectedRows).toEqual(a.affectedRows);
        }
      }
    }
    // the inserts' text once, and each distinct read once: parsed once, then only bound
    expect(fast.preparedStatements).toBe(1 + new Set(reads.map(([t]) => t)).size);
    const { rows: prepared } = await fast.query<{ n: number }>("select count(*)::int as n from pg_prepared_statements");
    expect(prepared[0].n).toBe(fast.preparedStatements);
    // drizzle reads timestamps and their arrays as text, also after PGlite added its array parsers
    const [first] = (await fast.query<{ at: unknown; ats: unknown }>("select at, ats from things where name = $1", ["first"])).rows;
    expect(first).toEqual({ at: "2026-12-03 20:00:00.123+00", ats: '{"2026-01-01 00:00:00+00","2026-02-01 12:30:00+00"}' });
  });

  it("fails a query with PostgreSQL's own error and stays usable, the statement included", async () => {
    const fast = await open(() => new DrizzlePGlite(undefined));
    const insert = "insert into things (name) values ($1)";
    await fast.query(insert, ["only once"]);
    const duplicate = await fast.query(insert, ["only once"]).catch((e: unknown) => e);
    expect(duplicate).toMatchObject({ code: "23505", query: insert, params: ["only once"] });
    // an error in binding (not a uuid), then one in parsing (no such column)
    await expect(fast.query("select * from things where ref = $1", ["not-a-uuid"])).rejects.toMatchObject({ code: "22P02" });
    await expect(fast.query("select nothing from things where id = $1", [1])).rejects.toMatchObject({ code: "42703" });
    // statements dropped behind the client's back are prepared again
    await fast.exec("deallocate all");
    await fast.query(insert, ["another"]);
    const { rows: names } = await fast.query<{ name: string }>("select name from things where id > $1 order by id", [0]);
    expect(names.map((r) => r.name)).toEqual(["only once", "another"]);
  });

  it(`keeps at most ${STATEMENT_CACHE_SIZE} statements, closing the least recently used`, async () => {
    const fast = await open(() => new DrizzlePGlite(undefined));
    const text = (i: number) => `select $1::int + ${i} as n`;
    for (let i = 0; i < STATEMENT_CACHE_SIZE + 20; i++) {
      // the first statement stays in use, so it is never the least recently used one
      if (i % 50 === 0) expect((await fast.query<{ n: number }>(text(0), [1])).rows[0].n).toBe(1);
      expect((await fast.query<{ n: number }>(text(i), [2])).rows[0].n).toBe(2 + i);
    }
    expect(fast.preparedStatements).toBe(STATEMENT_CACHE_SIZE);
    const { rows } = await fast.query<{ n: number; first: boolean }>(
      "select count(*)::int as n, bool_or(statement like '%+ 0 as n') as first from pg_prepared_statements",
    );
    expect(rows[0]).toEqual({ n: STATEMENT_CACHE_SIZE, first: true });
    // a closed statement is parsed again when it comes back
    expect((await fast.query<{ n: number }>(text(1), [5])).rows[0].n).toBe(6);
  });

  it("keeps PGlite's locking: queries wait for a transaction, and a rolled-back one leaves nothing", async () => {
    const fast = await open(() => new DrizzlePGlite(undefined));
    const insert = "insert into things (name) values ($1)";
    const count = "select count(*)::int as n from things where name like $1";
    let inside = -1;
    const tx = fast
      .transaction(async (t) => {
        for (let i = 0; i < 20; i++) await t.query(insert, [`tx ${i}`], drizzleOptions("object"));
        inside = (await t.query<{ n: number }>(count, ["tx %"])).rows[0].n;
        throw new Error("roll back");
      })
      .catch((e: Error) => e.message);
    const outside = Promise.all(
      Array.from({ length: 30 }, (_, i) => fast.query(insert, [`out ${i}`]).then(() => fast.query<{ n: number }>(count, ["tx %"]))),
    );
    expect(await tx).toBe("roll back");
    expect(inside).toBe(20);
    // no query ran inside the transaction: none saw its rows, and they are gone
    expect((await outside).map((r) => r.rows[0].n)).toEqual(Array(30).fill(0));
    expect((await fast.query<{ n: number }>(count, ["%"])).rows[0].n).toBe(30);
  });
});
