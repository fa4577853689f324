import Papa from 'papaparse';
import { BENCH_READINGS_LIMIT } from '../../shared/chemistry/bench.js';
import { benchReadingSchema } from '../../shared/schemas/bench.js';
import { ValidationError } from '../errors.js';
import type { Reading } from './titrations.js';

/**
 * Our readings file: a header line `volume_ml,ph` with an optional `temperature_c` column
 * (any order), then one reading per line, comma separated, decimal point, cumulative volumes.
 * Every error names its line and column.
 */

const COLUMNS = { volume_ml: 'volumeMl', ph: 'pH', temperature_c: 'temperatureC' } as const;
type Column = keyof typeof COLUMNS;
const FIELD_COLUMN: Record<string, Column> = { volumeMl: 'volume_ml', pH: 'ph', temperatureC: 'temperature_c' };
const CSV_TYPES = new Set(['text/csv', 'application/csv', 'text/x-csv', 'application/x-csv', 'text/plain', 'application/vnd.ms-excel', 'text/comma-separated-values']);
const MAX_ERRORS = 20;
const NUMBER = /^[+-]?(\d+(\.\d*)?|\.\d+)$/;

export function assertCsvFile(file: { originalname: string; mimetype: string; buffer: Buffer }) {
  const named = /\.(csv|txt)$/i.test(file.originalname);
  if (!named || !CSV_TYPES.has(file.mimetype.toLowerCase())) {
    throw new ValidationError('The readings file must be a CSV file (volume_ml,ph[,temperature_c]).', { file: `must be a .csv file of type text/csv (got ${file.mimetype || 'no type'}, ${file.originalname || 'no name'})` });
  }
  if (file.buffer.includes(0)) throw new ValidationError('The readings file is not text.', { file: 'not a text CSV file' });
}

export function parseReadingsCsv(buffer: Buffer): Reading[] {
  const text = buffer.toString('utf8').replace(/^\uFEFF/, '');
  const parsed = Papa.parse<string[]>(text, { delimiter: ',', skipEmptyLines: false });
  const errors: Record<string, string> = {};
  const messages: string[] = [];
  const fail = (line: number, column: string | null, reason: string) => {
    if (messages.length >= MAX_ERRORS) return;
    errors[column ? `line.${line}.${column}` : `line.${line}`] = reason;
    messages.push(`line ${line}${column ? `, column ${column}` : ''}: ${reason}`);
  };

  // Line of each parsed row, counting newlines inside quoted fields.
  const lines: number[] = [];
  let line = 1;
  for (const row of parsed.data) {
    lines.push(line);
    line += 1 + row.reduce((n, f) => n + (f.match(/\r\n|\n|\r/g)?.length ?? 0), 0);
  }
  for (const e of parsed.errors) if (e.row !== undefined && e.code !== 'UndetectableDelimiter') fail(lines[e.row] ?? e.row + 1, null, e.message);

  const rows = parsed.data.map((cells, i) => ({ cells, line: lines[i] })).filter((r) => !(r.cells.length === 1 && r.cells[0].trim() === ''));
  if (rows.length === 0) throw new ValidationError('The readings file is empty.', { file: 'no header and no readings' });
  const header = rows[0];
  const names = header.cells.map((c) => c.trim().toLowerCase());
  for (const [i, n] of names.entries()) {
    if (!(n in COLUMNS)) fail(header.line, header.cells[i].trim() || `#${i + 1}`, NUMBER.test(n) ? 'expected the header line volume_ml,ph[,temperature_c] first' : 'unknown column; use volume_ml, ph and optionally temperature_c');
  }
  for (const need of ['volume_ml', 'ph'] as const) if (!names.includes(need)) fail(header.line, need, 'missing from the header');
  if (new Set(names).size !== names.length) fail(header.line, null, 'a column is named twice');
  if (messages.length) throw new ValidationError(`Readings file, ${messages[0]}.`, errors);

  const readings: Reading[] = [];
  let previous: { volume: number; line: number } | null = null;
  for (const r of rows.slice(1)) {
    if (r.cells.length !== names.length) {
      fail(r.line, null, `expected ${names.length} values (${names.join(',')}), found ${r.cells.length}`);
      continue;
    }
    const raw: Record<string, number | null> = {};
    let bad = false;
    names.forEach((n, i) => {
      const v = r.cells[i].trim();
      if (v === '' && n === 'temperature_c') raw[COLUMNS[n]] = null;
      else if (!NUMBER.test(v)) {
        fail(r.line, n, v === '' ? 'missing value' : `"${v.slice(0, 20)}" is not a number (use a decimal point)`);
        bad = true;
      } else raw[COLUMNS[n as Column]] = Number(v);
    });
    if (bad) continue;
    const checked = benchReadingSchema.safeParse(raw);
    if (!checked.success) {
      for (const issue of checked.error.issues) fail(r.line, FIELD_COLUMN[String(issue.path[0])] ?? null, issue.message);
      continue;
    }
    if (previous && checked.data.volumeMl < previous.volume) {
      fail(r.line, 'volume_ml', `${checked.data.volumeMl} is less than ${previous.volume} on line ${previous.line}; volumes are cumulative`);
    }
    previous = { volume: checked.data.volumeMl, line: r.line };
    readings.push({ volumeMl: checked.data.volumeMl, pH: checked.data.pH, temperatureC: checked.data.temperatureC ?? null });
    if (readings.length > BENCH_READINGS_LIMIT) {
      fail(r.line, null, `more than ${BENCH_READINGS_LIMIT} readings`);
      break;
    }
  }
  if (messages.length) throw new ValidationError(`Readings file, ${messages[0]}${messages.length > 1 ? ` (and ${messages.length - 1} more)` : ''}.`, errors);
  if (readings.length < 2) throw new ValidationError('The readings file needs at least two readings.', { file: 'at least two readings after the header' });
  return readings;
}
