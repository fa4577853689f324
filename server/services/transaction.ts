import type { Transaction } from 'sequelize';
import { sequelize } from '../db/current.js';

/**
 * Runs `work` in the caller's transaction when there is one (the demo seed runs many service
 * calls in one), else in a new one, so a service never half-saves.
 */
export function inTransaction<T>(outer: Transaction | undefined, work: (t: Transaction) => Promise<T>): Promise<T> {
  return outer ? work(outer) : sequelize().transaction(work);
}
