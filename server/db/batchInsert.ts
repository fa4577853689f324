import type { Model, ModelStatic, Transaction } from 'sequelize';

type Values = Record<string, unknown>;
interface Attribute {
  field?: string;
  fieldName: string;
  autoIncrement?: boolean;
  defaultValue?: unknown;
}

/** The connection a Sequelize transaction holds (the mariadb connector's own). */
interface RawConnection {
  execute(sql: string, values: unknown[]): Promise<{ insertId: number | bigint | string; affectedRows: number }>;
}

/** Rows a statement at most (a titration has about 65 columns: well under the 65,535 placeholders a statement may have). */
const CHUNK = 500;
const tupleLists = new Map<string, string>();
/** `(?,…),(?,…)…` for `count` rows, kept: an import's statements repeat the same few texts. */
function tupleList(tuple: string, count: number): string {
  const key = `${count}${tuple}`;
  let list = tupleLists.get(key);
  if (list === undefined) tupleLists.set(key, (list = Array.from({ length: count }, () => tuple).join(',')));
  return list;
}

/**
 * A time as the UTC text Sequelize writes (`2026-03-08 06:30:15.123`): the connector would
 * write a Date in the process's local time, so a server not on UTC would store shifted times.
 */
const utc = (d: Date) => d.toISOString().slice(0, 23).replace('T', ' ');

interface Plan {
  head: string;
  tuple: string;
  /** per column: its attribute, a timestamp filled with `now`, its default */
  columns: Array<{ name: string; stamp: boolean; defaultValue: unknown }>;
}
const plans = new WeakMap<ModelStatic<Model>, Plan>();

/** The model's INSERT head and column list, worked out once per model. */
function planOf(model: ModelStatic<Model>): Plan {
  let plan = plans.get(model);
  if (plan) return plan;
  const attributes: Attribute[] = Object.entries(model.getAttributes()).map(([fieldName, a]) => ({ fieldName, field: a.field, autoIncrement: a.autoIncrement, defaultValue: a.defaultValue }));
  const options = model.options as { timestamps?: boolean; createdAt?: string | boolean; updatedAt?: string | boolean };
  const stamps = new Set<string>();
  if (options.timestamps !== false) {
    if (options.createdAt !== false) stamps.add(typeof options.createdAt === 'string' ? options.createdAt : 'createdAt');
    if (options.updatedAt !== false) stamps.add(typeof options.updatedAt === 'string' ? options.updatedAt : 'updatedAt');
  }
  const columns = attributes.filter((a) => !a.autoIncrement);
  plan = {
    head: `INSERT INTO \`${model.getTableName() as string}\` (${columns.map((a) => `\`${a.field ?? a.fieldName}\``).join(',')}) VALUES `,
    tuple: `(${columns.map(() => '?').join(',')})`,
    columns: columns.map((a) => ({ name: a.fieldName, stamp: stamps.has(a.fieldName), defaultValue: a.defaultValue })),
  };
  plans.set(model, plan);
  return plan;
}

/**
 * Rows of one model in one multi-row INSERT on the transaction's own connection, without
 * building Sequelize instances (an import's thousands of rows). Values are keyed by attribute
 * name as the model has them; the model's defaults and timestamps are filled in as `create`
 * would. Returns the ids given, consecutive from the first (InnoDB gives one simple multi-row
 * statement consecutive auto-increment values).
 */
export async function batchInsert(model: ModelStatic<Model>, rows: Values[], t: Transaction, now = new Date()): Promise<number[]> {
  if (!rows.length) return [];
  const { head, tuple, columns } = planOf(model);
  const ids: number[] = [];
  const conn = (t as unknown as { connection: RawConnection }).connection;
  for (let i = 0; i < rows.length; i += CHUNK) {
    const chunk = rows.length <= CHUNK ? rows : rows.slice(i, i + CHUNK);
    const values: unknown[] = new Array(chunk.length * columns.length);
    let n = 0;
    for (const row of chunk) {
      for (const c of columns) {
        let v = row[c.name];
        if (v === undefined) v = c.stamp ? now : c.defaultValue === undefined ? null : c.defaultValue;
        if (v instanceof Date) v = utc(v);
        else if (v !== null && typeof v === 'object' && !Buffer.isBuffer(v)) v = JSON.stringify(v);
        values[n++] = v;
      }
    }
    // the binary protocol (a prepared statement, cached by the connector per text): values go
    // as they are, without escaping them into the statement's text
    const res = await conn.execute(head + tupleList(tuple, chunk.length), values);
    const first = Number(res.insertId);
    for (let k = 0; k < chunk.length; k++) ids.push(first + k);
  }
  return ids;
}

/**
 * Instances built in memory (`Model.build`, defaults applied), saved in one statement; each gets
 * its id and timestamps as `save` would give them, without Sequelize's per-row save machinery.
 */
export async function insertBuilt<M extends Model>(model: ModelStatic<M>, rows: M[], t: Transaction): Promise<M[]> {
  const now = new Date();
  for (const row of rows) {
    row.setDataValue('createdAt' as never, now as never);
    row.setDataValue('updatedAt' as never, now as never);
  }
  const ids = await batchInsert(model, rows.map((r) => r.dataValues as Values), t, now);
  rows.forEach((row, i) => {
    row.setDataValue('id' as never, ids[i] as never);
    row.isNewRecord = false;
  });
  return rows;
}

