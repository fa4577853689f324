import { QueryTypes, type Transaction } from 'sequelize';
import { BENCH_SETTING_DEFAULTS, type BenchSettings } from '../../shared/schemas/bench.js';
import type { benchSettingsSchema } from '../../shared/schemas/bench.js';
import type { z } from 'zod';
import { sequelize } from '../db/current.js';
import type { Actor } from './actor.js';
import { audit } from './audit.js';
import { inTransaction } from './transaction.js';

type Key = keyof BenchSettings;
const KEYS = Object.keys(BENCH_SETTING_DEFAULTS) as Key[];

/** lab_settings keys: `bench.<name>` for every lab, `lab.<id>.bench.<name>` for one; `caco3.factor` is the older global key. */
const globalKey = (k: Key) => `bench.${k}`;
const labKey = (labId: number, k: Key) => `lab.${labId}.bench.${k}`;
const LEGACY: Partial<Record<Key, string>> = { caco3Factor: 'caco3.factor' };

function parseValue(raw: unknown): unknown {
  if (typeof raw !== 'string') return raw;
  try {
    return JSON.parse(raw);
  } catch {
    return raw;
  }
}

async function rows(labId: number, transaction?: Transaction) {
  const keys = KEYS.flatMap((k) => [globalKey(k), labKey(labId, k), ...(LEGACY[k] ? [LEGACY[k]!] : [])]);
  // Raw queries always name their type: the mariadb dialect cannot format untyped raw results.
  const found = await sequelize().query<{ key: string; value: unknown }>('SELECT `key`, `value` FROM lab_settings WHERE `key` IN (:keys)', {
    replacements: { keys },
    type: QueryTypes.SELECT,
    transaction,
  });
  return new Map(found.map((r) => [r.key, parseValue(r.value)]));
}

// Settings change only in their own transaction, so one read per transaction and lab is enough.
const perTransaction = new WeakMap<Transaction, Map<number, BenchSettings>>();

/** The bench limits in force for a laboratory: its own values over the global ones over the defaults (domain.md). */
export async function benchSettings(labId: number, transaction?: Transaction): Promise<BenchSettings> {
  const cached = transaction && perTransaction.get(transaction)?.get(labId);
  if (cached) return cached;
  const found = await rows(labId, transaction);
  const out = { ...BENCH_SETTING_DEFAULTS } as Record<Key, number>;
  for (const k of KEYS) {
    const v = found.get(labKey(labId, k)) ?? found.get(globalKey(k)) ?? (LEGACY[k] ? found.get(LEGACY[k]!) : undefined);
    const n = Number(v);
    if (v !== undefined && v !== null && Number.isFinite(n)) out[k] = n;
  }
  if (transaction) perTransaction.set(transaction, (perTransaction.get(transaction) ?? new Map()).set(labId, out as BenchSettings));
  return out as BenchSettings;
}

export async function getBenchSettings(actor: Actor) {
  const found = await rows(actor.labId);
  const overrides = Object.fromEntries(KEYS.filter((k) => found.has(labKey(actor.labId, k))).map((k) => [k, Number(found.get(labKey(actor.labId, k)))]));
  return { settings: await benchSettings(actor.labId), defaults: BENCH_SETTING_DEFAULTS, overrides };
}

/** The lab administrator sets the lab's own limits; they apply to results computed from now on. */
export async function updateBenchSettings(actor: Actor, input: z.output<typeof benchSettingsSchema>) {
  const before = await benchSettings(actor.labId);
  await inTransaction(undefined, async (transaction) => {
    const now = new Date();
    for (const [k, v] of Object.entries(input) as Array<[Key, number | undefined]>) {
      if (v === undefined) continue;
      await sequelize().query(
        'INSERT INTO lab_settings (`key`, `value`, created_at, updated_at) VALUES (:key, :value, :now, :now) ON DUPLICATE KEY UPDATE `value` = VALUES(`value`), updated_at = VALUES(updated_at)',
        { replacements: { key: labKey(actor.labId, k), value: JSON.stringify(v), now }, type: QueryTypes.INSERT, transaction },
      );
    }
    await audit(actor, { action: 'settings.updated', entity: 'lab_settings', entityId: `lab.${actor.labId}.bench`, organizationId: actor.labId, before, after: { ...before, ...input } }, transaction);
  });
  return getBenchSettings(actor);
}
