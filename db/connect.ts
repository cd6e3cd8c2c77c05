import {
  Kysely,
  PostgresDialect,
  type CompiledQuery,
  type DatabaseConnection,
  type Driver,
  type QueryResult,
  type TransactionSettings,
} from "kysely";
import pg from "pg";
import type { Database } from "./schema";

// NUMERIC comes back from pg as a string; the product stores money and measurements
// in NUMERIC columns and works with them as numbers.
pg.types.setTypeParser(pg.types.builtins.NUMERIC, (v) => (v === null ? null : Number(v)));
pg.types.setTypeParser(pg.types.builtins.INT8, (v) => (v === null ? null : Number(v)));

// What the server or the network says when the database is away (restarting, failing
// over, unreachable), as opposed to a query's own error: SQLSTATE class 08 (connection
// exception), 57P01–57P03 (shut down by the administrator, crashed, still starting up),
// 53300 (too many connections), and the sockets' own codes.
const UNREACHABLE_CODES = new Set([
  "08000",
  "08001",
  "08003",
  "08004",
  "08006",
  "57P01",
  "57P02",
  "57P03",
  "53300",
  "ECONNREFUSED",
  "ECONNRESET",
  "ETIMEDOUT",
  "EPIPE",
  "ENOTFOUND",
  "EHOSTUNREACH",
  "ENETUNREACH",
  "EAI_AGAIN",
]);
// pg's own errors for a dead connection carry no code, only these messages.
const UNREACHABLE_MESSAGES =
  /Connection terminated|connection error and is not queryable|Client was closed and is not queryable|timeout exceeded when trying to connect|Connection ended unexpectedly/i;

/** True when `e` says the database cannot be reached, not that a query was wrong. */
export function isConnectionError(e: unknown, depth = 0): boolean {
  if (!e || typeof e !== "object" || depth > 4) return false;
  const { code, message, cause, errors } = e as {
    code?: unknown;
    message?: unknown;
    cause?: unknown;
    errors?: unknown;
  };
  if (typeof code === "string" && UNREACHABLE_CODES.has(code)) return true;
  if (typeof message === "string" && UNREACHABLE_MESSAGES.test(message)) return true;
  if (Array.isArray(errors) && errors.some((x) => isConnectionError(x, depth + 1))) return true;
  return isConnectionError(cause, depth + 1);
}

export type CreateDbOptions = {
  /** turns a failed query's error into what the caller throws (the app maps lost connections) */
  mapError?: (e: unknown) => unknown;
};

export function createDb(
  connectionString: string,
  max = 10,
  options: CreateDbOptions = {},
): Kysely<Database> {
  const pool = new pg.Pool({ connectionString, max, connectionTimeoutMillis: 5000 });
  // A restart or failover closes the pool's idle connections with an 'error' event; pg
  // throws it (and ends the process) when nobody listens. The pool drops those
  // connections itself and opens new ones on the next query.
  let lastWarned = 0;
  pool.on("error", (e) => {
    if (Date.now() - lastWarned < 10_000) return;
    lastWarned = Date.now();
    console.warn(`db: lost an idle connection (${e.message}); new ones are opened as needed`);
  });
  // A connection lent out (between a transaction's statements) reports on the client;
  // its next query fails, and the pool discards it when it comes back.
  pool.on("connect", (client) => client.on("error", () => {}));
  const mapError = options.mapError;
  return new Kysely<Database>({
    dialect: mapError ? new MappedErrorsDialect({ pool }, mapError) : new PostgresDialect({ pool }),
  });
}

/** PostgreSQL, with every error of the driver passed through `mapError` before it is thrown. */
class MappedErrorsDialect extends PostgresDialect {
  readonly #mapError: (e: unknown) => unknown;
  constructor(
    config: ConstructorParameters<typeof PostgresDialect>[0],
    mapError: (e: unknown) => unknown,
  ) {
    super(config);
    this.#mapError = mapError;
  }
  override createDriver(): Driver {
    return new MappedErrorsDriver(super.createDriver(), this.#mapError);
  }
}

class MappedConnection implements DatabaseConnection {
  constructor(
    readonly inner: DatabaseConnection,
    private readonly mapError: (e: unknown) => unknown,
  ) {}
  async executeQuery<R>(query: CompiledQuery): Promise<QueryResult<R>> {
    try {
      return await this.inner.executeQuery<R>(query);
    } catch (e) {
      throw this.mapError(e);
    }
  }
  async *streamQuery<R>(query: CompiledQuery, chunkSize?: number) {
    try {
      yield* this.inner.streamQuery<R>(query, chunkSize);
    } catch (e) {
      throw this.mapError(e);
    }
  }
}

class MappedErrorsDriver implements Driver {
  constructor(
    private readonly inner: Driver,
    private readonly mapError: (e: unknown) => unknown,
  ) {}
  private async guard<T>(run: () => Promise<T>): Promise<T> {
    try {
      return await run();
    } catch (e) {
      throw this.mapError(e);
    }
  }
  init() {
    return this.guard(() => this.inner.init());
  }
  acquireConnection() {
    return this.guard(
      async () => new MappedConnection(await this.inner.acquireConnection(), this.mapError),
    );
  }
  beginTransaction(c: DatabaseConnection, settings: TransactionSettings) {
    return this.guard(() => this.inner.beginTransaction(innerOf(c), settings));
  }
  commitTransaction(c: DatabaseConnection) {
    return this.guard(() => this.inner.commitTransaction(innerOf(c)));
  }
  rollbackTransaction(c: DatabaseConnection) {
    return this.guard(() => this.inner.rollbackTransaction(innerOf(c)));
  }
  savepoint(
    c: DatabaseConnection,
    name: string,
    compile: Parameters<NonNullable<Driver["savepoint"]>>[2],
  ) {
    return this.guard(() => this.inner.savepoint!(innerOf(c), name, compile));
  }
  rollbackToSavepoint(
    c: DatabaseConnection,
    name: string,
    compile: Parameters<NonNullable<Driver["rollbackToSavepoint"]>>[2],
  ) {
    return this.guard(() => this.inner.rollbackToSavepoint!(innerOf(c), name, compile));
  }
  releaseSavepoint(
    c: DatabaseConnection,
    name: string,
    compile: Parameters<NonNullable<Driver["releaseSavepoint"]>>[2],
  ) {
    return this.guard(() => this.inner.releaseSavepoint!(innerOf(c), name, compile));
  }
  releaseConnection(c: DatabaseConnection) {
    return this.inner.releaseConnection(innerOf(c));
  }
  destroy() {
    return this.inner.destroy();
  }
}

const innerOf = (c: DatabaseConnection) => (c instanceof MappedConnection ? c.inner : c);
