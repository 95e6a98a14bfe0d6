// Read-then-write transactions that are correct on both databases.
//
// SQLite: every managed transaction of the process runs alone (models/db.ts) and takes the
// writer lock at BEGIN IMMEDIATE, so a read inside it cannot go stale before the write.
// PostgreSQL: transactions run concurrently at READ COMMITTED; a row read and then written on
// must be locked (`SELECT … FOR UPDATE`) inside the transaction, or two requests both read the
// old value. `lockRow` does that (a no-op clause on SQLite, which has no row locks and needs
// none); `withWriteTransaction` retries the whole function when PostgreSQL reports a
// deadlock or a serialization failure, which a lock order can still produce.
import { literal, type Model, type ModelStatic, type Sequelize, type Transaction, type WhereOptions } from "sequelize";
import { getSequelize } from "./db";

const RETRYABLE_PG_CODES = new Set(["40001", "40P01"]); // serialization_failure, deadlock_detected
const MAX_ATTEMPTS = 5;

function pgCode(err: unknown): string | undefined {
  const e = err as { parent?: { code?: string }; original?: { code?: string }; code?: string } | null;
  return e?.parent?.code ?? e?.original?.code ?? (typeof e?.code === "string" ? e.code : undefined);
}

/** True for a PostgreSQL deadlock or serialization failure (the transaction may simply be run again). */
export function isRetryableTransactionError(err: unknown): boolean {
  const code = pgCode(err);
  return code !== undefined && RETRYABLE_PG_CODES.has(code);
}

/**
 * Runs `fn` in a managed transaction and retries it (up to 5 attempts, short random back-off)
 * when PostgreSQL aborts it with a deadlock or serialization failure. `fn` must be safe to run
 * again: do no outside effects (mail, files) inside it. Errors the function throws itself
 * (AppError, zod) pass through unchanged.
 */
export async function withWriteTransaction<T>(
  fn: (transaction: Transaction) => Promise<T>,
  { sequelize = getSequelize() }: { sequelize?: Sequelize } = {},
): Promise<T> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await sequelize.transaction(fn);
    } catch (err) {
      if (attempt >= MAX_ATTEMPTS || !isRetryableTransactionError(err)) throw err;
      await new Promise((r) => setTimeout(r, 5 + Math.random() * 20 * attempt));
    }
  }
}

/**
 * The row matching `where`, locked until `transaction` ends (`FOR UPDATE` on PostgreSQL; on
 * SQLite the transaction already holds the database's writer lock). Null when no row matches.
 * Locks only the model's own table; do not pass includes (an outer join cannot be locked).
 */
export async function lockRow<M extends Model>(
  model: ModelStatic<M>,
  where: WhereOptions<M>,
  transaction: Transaction,
): Promise<M | null> {
  return model.findOne({ where, transaction, lock: transaction.LOCK.UPDATE });
}

/** Every row matching `where`, locked in primary-key order (a fixed order cannot deadlock with itself). */
export async function lockRows<M extends Model>(
  model: ModelStatic<M>,
  where: WhereOptions<M>,
  transaction: Transaction,
): Promise<M[]> {
  return model.findAll({ where, transaction, lock: transaction.LOCK.UPDATE, order: [["id", "ASC"]] });
}

/**
 * ORDER BY for a text column that is the same on every database and cluster locale: code-point
 * (byte) order, which is SQLite's default BINARY collation and PostgreSQL's "C" collation.
 * Qualified by table so it stays unambiguous beside includes. Use with a tie-breaker, e.g.
 * `order: [byText("boards", "name"), ["id", "ASC"]]`.
 */
export function byText(
  table: string,
  column: string,
  direction: "ASC" | "DESC" = "ASC",
  sequelize: Sequelize = getSequelize(),
) {
  const qi = sequelize.getQueryInterface();
  const quoted = `${qi.quoteIdentifier(table)}.${qi.quoteIdentifier(column)}`;
  const collate = sequelize.getDialect() === "postgres" ? ' COLLATE "C"' : "";
  return [literal(`${quoted}${collate}`), direction] as [ReturnType<typeof literal>, string];
}
