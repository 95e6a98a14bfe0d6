// One Sequelize instance per process. Route handlers are re-evaluated on hot reload in
// development, so the instance is cached on globalThis rather than in module scope
// (a new connection per reload would leave WAL readers open and locks behind).
import fs from "node:fs";
import path from "node:path";
import { Sequelize, Transaction, type Options } from "sequelize";

export const DEFAULT_DATABASE_URL = "sqlite:./data/railwise.sqlite";

/** SQLite waits this long for another writer before answering SQLITE_BUSY. */
export const BUSY_TIMEOUT_MS = 10_000;

export function databaseUrl(): string {
  return process.env.DATABASE_URL?.trim() || DEFAULT_DATABASE_URL;
}

export type Dialect = "sqlite" | "postgres";

export function dialectOf(url: string): Dialect {
  if (/^postgres(ql)?:\/\//i.test(url)) return "postgres";
  if (/^sqlite:/i.test(url)) return "sqlite";
  throw new Error(`DATABASE_URL must start with "sqlite:" or "postgres://" (got "${maskUrl(url)}")`);
}

/** The URL with its password (and any `password=` query parameter) replaced by `***`, for logs. */
export function maskUrl(url: string): string {
  return url
    .replace(/^([a-z][a-z0-9+.-]*:\/\/[^/@:?#]*):[^@/?#]*@/i, "$1:***@")
    .replace(/([?&](?:password|sslpassword)=)[^&#]*/gi, "$1***");
}

/** Any text (an error message, a stack) with every database URL in it masked. */
export function maskSecrets(text: string): string {
  let out = text.replace(/\b(postgres(?:ql)?:\/\/[^\s"'`]+)/gi, (m) => maskUrl(m));
  const pass = passwordOf(databaseUrl());
  if (pass && pass.length >= 3) out = out.split(pass).join("***");
  return out;
}

function passwordOf(url: string): string | null {
  try {
    if (dialectOf(url) !== "postgres") return null;
    const parsed = new URL(url);
    return parsed.password ? decodeURIComponent(parsed.password) : null;
  } catch {
    return null;
  }
}

/** `sqlite:./data/x.sqlite`, `sqlite:///abs/x.sqlite`, `sqlite:/abs/x.sqlite`, `sqlite::memory:` → storage path. */
export function sqliteStorage(url: string): string {
  let rest = url.replace(/^sqlite:/i, "");
  if (rest === ":memory:") return rest;
  if (rest.startsWith("//")) rest = rest.slice(2);
  if (!rest) throw new Error("DATABASE_URL names no SQLite file");
  return path.resolve(rest);
}

interface SqliteConnection {
  exec(sql: string, cb: (err: Error | null) => void): void;
}

// Sequelize's SQLite dialect opens a fresh connection for every transaction and does not
// run the connect hooks, so the pragmas are applied by wrapping getConnection itself.
function applyPragmasOnEveryConnection(sequelize: Sequelize) {
  const manager = sequelize.connectionManager as unknown as {
    getConnection(options?: unknown): Promise<SqliteConnection>;
  };
  const original = manager.getConnection.bind(manager);
  const ready = new WeakMap<object, Promise<void>>();
  manager.getConnection = async (options?: unknown) => {
    const connection = await original(options);
    let pending = ready.get(connection);
    if (!pending) {
      pending = new Promise<void>((resolve, reject) =>
        connection.exec(
          `PRAGMA busy_timeout = ${BUSY_TIMEOUT_MS}; PRAGMA journal_mode = WAL; PRAGMA foreign_keys = ON; PRAGMA synchronous = NORMAL;`,
          (err) => (err ? reject(err) : resolve()),
        ),
      );
      ready.set(connection, pending);
    }
    await pending;
    return connection;
  };
}

// SQLite has one writer at a time, and node-sqlite3 waits for a busy lock inside libuv's small
// thread pool: many concurrent write transactions can fill the pool with waiters while the lock
// holder cannot get a thread to commit (node-sqlite3#1039). Managed transactions of this process
// therefore run one after another; reads outside transactions still run concurrently (WAL).
function serializeManagedTransactions(sequelize: Sequelize) {
  const original = sequelize.transaction.bind(sequelize) as (...args: unknown[]) => Promise<unknown>;
  let queue: Promise<unknown> = Promise.resolve();
  (sequelize as unknown as { transaction: (...args: unknown[]) => Promise<unknown> }).transaction = (
    ...args: unknown[]
  ) => {
    if (typeof args[args.length - 1] !== "function") return original(...args); // unmanaged: caller commits
    const run = queue.then(() => original(...args));
    queue = run.catch(() => undefined);
    return run;
  };
}

export function createSequelize(url = databaseUrl()): Sequelize {
  const common: Options = {
    logging: process.env.RAILWISE_SQL_LOG ? console.log : false,
    define: { freezeTableName: true },
  };
  if (dialectOf(url) === "postgres") {
    // The `pg` driver is a pinned dependency; same models and migrations. Every session runs
    // in UTC so timestamps compare the same as on SQLite; READ COMMITTED plus explicit row locks
    // (see models/transactions.ts) make read-then-write transactions safe.
    return new Sequelize(url, {
      ...common,
      dialect: "postgres",
      timezone: "+00:00",
      isolationLevel: Transaction.ISOLATION_LEVELS.READ_COMMITTED,
      pool: { max: Number(process.env.RAILWISE_PG_POOL_MAX || 10), min: 0, idle: 10_000, acquire: 30_000 },
      dialectOptions: { application_name: "railwise" },
    });
  }
  const storage = sqliteStorage(url);
  if (storage !== ":memory:") fs.mkdirSync(path.dirname(storage), { recursive: true });
  const sequelize = new Sequelize({
    ...common,
    dialect: "sqlite",
    storage,
    // Writers take the lock when the transaction starts, so two read-then-write
    // transactions cannot deadlock into SQLITE_BUSY (sequelize#10304).
    transactionType: Transaction.TYPES.IMMEDIATE,
    pool: { max: 1, min: 0, idle: 10_000 },
  });
  applyPragmasOnEveryConnection(sequelize);
  serializeManagedTransactions(sequelize);
  return sequelize;
}

const globalKey = Symbol.for("railwise.sequelize");
type GlobalWithDb = typeof globalThis & { [globalKey]?: { url: string; sequelize: Sequelize } };

/** The process-wide instance for DATABASE_URL (created on first use). */
export function getSequelize(): Sequelize {
  const g = globalThis as GlobalWithDb;
  const url = databaseUrl();
  const cached = g[globalKey];
  if (cached && cached.url === url) return cached.sequelize;
  const sequelize = createSequelize(url);
  g[globalKey] = { url, sequelize };
  return sequelize;
}
