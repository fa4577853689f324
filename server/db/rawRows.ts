import { QueryTypes, type Model, type ModelStatic, type Transaction } from 'sequelize';
import { sequelize } from './current.js';

/**
 * Model instances from raw SELECTs, for the few reads on every request or entry where building
 * the query and grouping a join each time costs more than the statement itself (the session, a
 * titration's sample and lot). Each gives the instance a model query would give; a test reads
 * every stored row both ways and compares them.
 */

type Row = Record<string, unknown>;

function attributesOf(model: ModelStatic<Model>, only?: readonly string[]) {
  const all = Object.entries(model.getAttributes());
  return only ? all.filter(([name]) => only.includes(name)) : all;
}

/** `alias.column AS \`prefix+attribute\`` for the attributes of a model (all, or those named). */
export function selectList(model: ModelStatic<Model>, alias: string, prefix = '', only?: readonly string[]): string {
  return attributesOf(model, only)
    .map(([name, a]) => `${alias}.\`${a.field ?? name}\` AS \`${prefix}${name}\``)
    .join(', ');
}

/**
 * An instance as a model query gives it from a row read with `selectList`. Sequelize's connection
 * already casts BOOLEAN, DATEONLY and JSON columns for raw queries as for model ones (the
 * comparison test fails otherwise); DECIMAL stays an exact string.
 */
export function fromRow<M extends Model>(model: ModelStatic<M>, row: Row, prefix = '', only?: readonly string[]): M {
  const values: Row = {};
  for (const [name] of attributesOf(model, only)) values[name] = row[prefix + name];
  return model.build(values as never, { raw: true, isNewRecord: false });
}

const selects = new WeakMap<ModelStatic<Model>, string>();

/** Rows of one model matching a raw WHERE (and ORDER/LIMIT/FOR UPDATE tail), as instances. */
export async function rawFind<M extends Model>(model: ModelStatic<M>, whereSql: string, replacements: unknown[], t?: Transaction): Promise<M[]> {
  let head = selects.get(model as ModelStatic<Model>);
  if (!head) selects.set(model as ModelStatic<Model>, (head = `SELECT ${selectList(model as ModelStatic<Model>, 'x')} FROM \`${model.getTableName() as string}\` x WHERE `));
  const rows = await sequelize().query<Row>(head + whereSql, { replacements, type: QueryTypes.SELECT, transaction: t });
  return rows.map((r) => fromRow(model, r));
}
