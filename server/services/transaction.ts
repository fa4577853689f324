import { Transaction } from 'sequelize';
import { sequelize } from '../db/current.js';

/** MariaDB's "deadlock found" and "lock wait timeout": the transaction was rolled back and may simply be run again. */
export function isRetryableLockError(err: unknown): boolean {
  const e = err as { parent?: { errno?: number }; original?: { errno?: number }; errno?: number };
  const errno = e?.parent?.errno ?? e?.original?.errno ?? e?.errno;
  return errno === 1213 || errno === 1205;
}

const ATTEMPTS = 4;

/**
 * Runs `work` in the caller's transaction when there is one (the demo seed runs many service
 * calls in one), else in a new one, so a service never half-saves. A new transaction that
 * MariaDB rolls back for a deadlock between concurrent writers is run again, a few times,
 * after a short random pause (common practice for InnoDB).
 */
export async function inTransaction<T>(outer: Transaction | undefined, work: (t: Transaction) => Promise<T>): Promise<T> {
  if (outer) return work(outer);
  for (let attempt = 1; ; attempt++) {
    try {
      // READ COMMITTED: row locks without InnoDB's gap locks, which concurrent entries into
      // neighbouring index ranges would otherwise deadlock on; every write still locks its rows.
      return await sequelize().transaction({ isolationLevel: Transaction.ISOLATION_LEVELS.READ_COMMITTED }, work);
    } catch (err) {
      if (attempt >= ATTEMPTS || !isRetryableLockError(err)) throw err;
      await new Promise((r) => setTimeout(r, 5 + Math.random() * 20 * attempt));
    }
  }
}
