import { computed } from 'vue';
import { InputError } from '@shared/errors';

export interface LiveOutcome<T> {
  result: T | null;
  /** Field → reason, shown beside the inputs. */
  fields: Record<string, string>;
  message: string | null;
}

/**
 * Runs a shared calculation on every change of the inputs it reads: the result, or the
 * InputError's field reasons for the form (the same schema the server answers 400 with).
 */
export function useLiveCalc<T>(run: () => T) {
  return computed((): LiveOutcome<T> => {
    try {
      return { result: run(), fields: {}, message: null };
    } catch (e) {
      if (e instanceof InputError) return { result: null, fields: e.fields, message: e.message };
      return { result: null, fields: {}, message: String(e) };
    }
  });
}

/** A typed decimal: blank is absent; a decimal comma is accepted; text that is not a number stays as is so the schema can name it. */
export function num(text: string): number | string | undefined {
  const t = text.trim();
  if (t === '') return undefined;
  const n = Number(t.replace(',', '.'));
  return Number.isFinite(n) ? n : t;
}

/** The body without absent fields, so defaults apply and strict schemas see no undefined keys. */
export function compact<T extends Record<string, unknown>>(body: T): T {
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(body)) if (v !== undefined) out[k] = v;
  return out as T;
}

/** A figure to `digits` decimals, or a dash. */
export function fixed(value: number | null | undefined, digits: number): string {
  return value === null || value === undefined || !Number.isFinite(value) ? '—' : value.toFixed(digits);
}
