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
  query(sql: string, values: unknown[]): Promise<{ insertId: number | bigint | string; affectedRows: number }>;
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
  const attributes: Attribute[] = Object.entries(model.getAttributes()).map(([fieldName, a]) => ({ fieldName, field: a.field, autoIncrement: a.autoIncrement, defaultValue: a.defaultValue }));
  const options = model.options as { timestamps?: boolean; createdAt?: string | boolean; updatedAt?: string | boolean };
  const stamps = new Set<string>();
  if (options.timestamps !== false) {
    if (options.createdAt !== false) stamps.add(typeof options.createdAt === 'string' ? options.createdAt : 'createdAt');
    if (options.updatedAt !== false) stamps.add(typeof options.updatedAt === 'string' ? options.updatedAt : 'updatedAt');
  }
  const columns = attributes.filter((a) => !a.autoIncrement);
  const value = (row: Values, a: Attribute) => {
    let v = row[a.fieldName];
    if (v === undefined && stamps.has(a.fieldName)) v = now;
    if (v === undefined && a.defaultValue !== undefined) v = a.defaultValue;
    if (v === undefined) v = null;
    if (v !== null && typeof v === 'object' && !(v instanceof Date) && !Buffer.isBuffer(v)) v = JSON.stringify(v);
    return v;
  };
  const ids: number[] = [];
  const conn = (t as unknown as { connection: RawConnection }).connection;
  const head = `INSERT INTO \`${model.getTableName() as string}\` (${columns.map((a) => `\`${a.field ?? a.fieldName}\``).join(',')}) VALUES `;
  const tuple = `(${columns.map(() => '?').join(',')})`;
  for (let i = 0; i < rows.length; i += 500) {
    const chunk = rows.slice(i, i + 500);
    const res = await conn.query(head + chunk.map(() => tuple).join(','), chunk.flatMap((r) => columns.map((a) => value(r, a))));
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
  for (const row of rows) row.set({ createdAt: now, updatedAt: now } as never, { raw: true });
  const ids = await batchInsert(model, rows.map((r) => ({ ...(r.dataValues as Values) })), t, now);
  rows.forEach((row, i) => {
    row.setDataValue('id' as never, ids[i] as never);
    row.isNewRecord = false;
    (row as unknown as { _previousDataValues: Values })._previousDataValues = { ...(row.dataValues as Values) };
  });
  return rows;
}

