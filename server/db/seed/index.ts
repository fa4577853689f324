import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { Config } from '../../config.js';
import { initModels } from '../models/index.js';
import { seedBench } from './bench.js';
import { seedBilling } from './billing.js';
import { seedIdentity } from './identity.js';
import { seedCompliance, seedPermits } from './permits.js';
import { seedReports } from './reports.js';

export interface SeedStep {
  key: string;
  run(ctx: { sequelize: Sequelize; config: Config; transaction: Transaction }): Promise<void>;
  /** The step opens its own transactions (it must see what earlier steps committed). */
  ownTransactions?: boolean;
}

/** Demo steps in order; later areas append theirs. Each runs once, in its own transaction. */
const steps: SeedStep[] = [
  {
    key: 'settings',
    async run({ sequelize, transaction }) {
      const now = new Date();
      await sequelize.getQueryInterface().bulkInsert('lab_settings', [{ key: 'caco3.factor', value: JSON.stringify('50000'), created_at: now, updated_at: now }], { transaction });
    },
  },
  { key: 'identity', run: seedIdentity },
  { key: 'bench', run: seedBench },
  { key: 'permits', run: seedPermits },
  { key: 'compliance', run: seedCompliance, ownTransactions: true },
  { key: 'reports', run: seedReports, ownTransactions: true },
  { key: 'billing', run: seedBilling, ownTransactions: true },
];

/**
 * Loads the invented demo scenario (product.md). Idempotent: each step leaves a marker
 * row `demo.<key>` in lab_settings and is skipped when the marker is there. Returns true
 * when anything was loaded.
 */
export async function seedDemo(sequelize: Sequelize, config: Config): Promise<boolean> {
  initModels(sequelize);
  // Raw queries always name their type: the mariadb dialect cannot format untyped raw results.
  const done = new Set(
    (await sequelize.query<{ key: string }>("SELECT `key` FROM lab_settings WHERE `key` LIKE 'demo.%'", { type: QueryTypes.SELECT })).map((r) => r.key),
  );
  let loaded = false;
  for (const step of steps) {
    if (done.has(`demo.${step.key}`)) continue;
    if (step.ownTransactions) await step.run({ sequelize, config, transaction: undefined as unknown as Transaction });
    await sequelize.transaction(async (transaction) => {
      if (!step.ownTransactions) await step.run({ sequelize, config, transaction });
      const now = new Date();
      await sequelize.getQueryInterface().bulkInsert('lab_settings', [{ key: `demo.${step.key}`, value: JSON.stringify(now.toISOString()), created_at: now, updated_at: now }], { transaction });
    });
    loaded = true;
  }
  return loaded;
}
