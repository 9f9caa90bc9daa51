import {
  parse,
  PGlite,
  protocol,
  types,
  type PGliteOptions,
  type QueryOptions,
  type Results,
  type Transaction,
} from "@electric-sql/pglite";

type BackendMessage = Awaited<ReturnType<PGlite["execProtocolStream"]>>[number];

const asText = (value: string) => value;

/**
 * The type parsers drizzle-orm's PGlite driver passes with every query (drizzle-orm/pglite/session.js,
 * 0.45): dates, times, intervals and their arrays stay text, and drizzle maps them itself.
 */
const DRIZZLE_PARSERS: Record<number, (value: string) => string> = {
  [types.TIMESTAMP]: asText,
  [types.TIMESTAMPTZ]: asText,
  [types.INTERVAL]: asText,
  [types.DATE]: asText,
  1231: asText, // numeric[]
  1115: asText, // timestamp[]
  1185: asText, // timestamptz[]
  1187: asText, // interval[]
  1182: asText, // date[]
};

/**
 * Drops the per-query parsers when they only repeat the instance's (DRIZZLE_PARSERS): PGlite copies
 * its ~300 default parsers into a new object for every result that brings its own, 0.15–0.35 ms a
 * query on this VM (docs/engine.md, "What a read costs").
 */
function withoutDrizzleParsers(options: QueryOptions | undefined): QueryOptions | undefined {
  const own = options?.parsers;
  if (!own) return options;
  for (const key of Object.keys(own)) if (!(key in DRIZZLE_PARSERS)) return options;
  const { parsers: _dropped, ...rest } = options;
  return rest;
}

/** How many named statements one database keeps (the least recently used is closed beyond that). */
export const STATEMENT_CACHE_SIZE = 500;

type Statement = { name: string; paramTypes: number[] };

/**
 * PGlite as drizzle-orm uses it, doing less per query than the stock client (issue 15 item 4):
 *
 * - Its default parsers are drizzle's, so the parsers drizzle sends with each query are dropped
 *   rather than merged into a fresh copy of all defaults for every result.
 * - A query with parameters is parsed and planned once: its text becomes a named prepared
 *   statement, and later calls only bind and execute it, as node-postgres does with a named query
 *   (PostgreSQL's plan cache then decides between custom and generic plans, as on a server). The
 *   list of projects went from ~0.9 to ~0.4 ms. Statements are closed least recently used first
 *   beyond STATEMENT_CACHE_SIZE. Queries inside a transaction, queries with a blob (COPY) or with
 *   explicit parameter types take PGlite's own path.
 *
 * Results, errors and locking are PGlite's: the same parser of results, the same error objects
 * (with the query and parameters attached), the same transaction and query locks.
 */
export class DrizzlePGlite extends PGlite {
  readonly #statements = new Map<string, Statement>();
  #nextName = 1;

  /** A data folder (none: in memory) and PGlite's options. */
  constructor(dataDir: string | undefined, options: PGliteOptions = {}) {
    super({ ...options, dataDir });
  }

  /** PGlite adds its array parsers here, at the end of its start: drizzle's win over them. */
  override async _initArrayTypes(options?: { force?: boolean }): Promise<void> {
    await super._initArrayTypes(options);
    Object.assign(this.parsers, DRIZZLE_PARSERS);
  }

  /** How many named statements are prepared (for tests). */
  get preparedStatements(): number {
    return this.#statements.size;
  }

  override async query<T>(query: string, params: unknown[] = [], options?: QueryOptions): Promise<Results<T>> {
    const opts = withoutDrizzleParsers(options);
    if (params.length === 0 || opts?.blob || opts?.paramTypes) return super.query<T>(query, params, opts);
    await this._checkReady();
    return this._runExclusiveTransaction(() => this._runExclusiveQuery(() => this.#runPrepared<T>(query, params, opts)));
  }

  override async transaction<T>(callback: (tx: Transaction) => Promise<T>): Promise<T> {
    return super.transaction((tx) =>
      callback(
        Object.create(tx, {
          query: { value: <R>(q: string, p?: unknown[], o?: QueryOptions) => tx.query<R>(q, p, withoutDrizzleParsers(o)) },
        }) as Transaction,
      ),
    );
  }

  async #runPrepared<T>(query: string, params: unknown[], options: QueryOptions | undefined): Promise<Results<T>> {
    try {
      return await this.#bindAndExecute<T>(query, params, options);
    } catch (e) {
      // the statement was dropped behind the cache's back (DEALLOCATE, DISCARD): prepare it again
      if (!(e instanceof protocol.messages.DatabaseError && e.code === "26000" && this.#statements.delete(query))) throw e;
      return this.#bindAndExecute<T>(query, params, options);
    }
  }

  async #bindAndExecute<T>(query: string, params: unknown[], options: QueryOptions | undefined): Promise<Results<T>> {
    const run = (message: Uint8Array) => this.execProtocolStream(message, { syncToFs: false, onNotice: options?.onNotice });
    const messages: BackendMessage[] = [];
    try {
      const statement = await this.#statement(query, run);
      const values = params.map((value, i) => {
        if (value === null || value === undefined) return null;
        const serialize = options?.serializers?.[statement.paramTypes[i]] ?? this.serializers[statement.paramTypes[i]];
        return serialize ? serialize(value) : String(value);
      });
      messages.push(
        ...(await run(protocol.serialize.bind({ statement: statement.name, values }))),
        ...(await run(protocol.serialize.describe({ type: "P" }))),
        ...(await run(protocol.serialize.execute({}))),
      );
    } catch (e) {
      if (e instanceof protocol.messages.DatabaseError) Object.assign(e, { query, params, queryOptions: options });
      throw e;
    } finally {
      messages.push(...(await run(protocol.serialize.sync())));
    }
    await this.syncToFs();
    return parse.parseResults(messages, this.parsers, options)[0] as Results<T>;
  }

  /** The named statement for this text, parsed now if it is new (and the oldest closed if full). */
  async #statement(query: string, run: (message: Uint8Array) => Promise<BackendMessage[]>): Promise<Statement> {
    const known = this.#statements.get(query);
    if (known) {
      // most recently used last (a Map keeps insertion order)
      this.#statements.delete(query);
      this.#statements.set(query, known);
      return known;
    }
    if (this.#statements.size >= STATEMENT_CACHE_SIZE) {
      const [oldestText, oldest] = this.#statements.entries().next().value!;
      this.#statements.delete(oldestText);
      await run(protocol.serialize.close({ type: "S", name: oldest.name }));
    }
    const name = `orthostack_${this.#nextName++}`;
    await run(protocol.serialize.parse({ name, text: query }));
    const paramTypes = parse.parseDescribeStatementResults(await run(protocol.serialize.describe({ type: "S", name })));
    const statement = { name, paramTypes };
    this.#statements.set(query, statement);
    return statement;
  }
}
