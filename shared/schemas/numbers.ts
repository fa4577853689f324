import { z } from 'zod';

/** Number fields shared by the calculation schemas: short, field-level reasons. */
export function number() {
  return z.number({ error: (issue) => (issue.input === undefined ? 'required' : 'must be a number') });
}

export function positive(max: number, unit: string) {
  return number()
    .gt(0, { error: 'must be greater than 0' })
    .lte(max, { error: `must be at most ${max} ${unit}` });
}

export function nonNegative(max: number, unit: string) {
  return number()
    .gte(0, { error: 'must be 0 or more' })
    .lte(max, { error: `must be at most ${max} ${unit}` });
}

export const ph = () =>
  number()
    .gte(0, { error: 'must be between 0 and 14' })
    .lte(14, { error: 'must be between 0 and 14' });

/** The equilibrium constants are published for 0–90 °C (Plummer and Busenberg 1982). */
export const temperatureC = () =>
  number()
    .gte(0, { error: 'must be between 0 and 90 °C (range of the equilibrium constants)' })
    .lte(90, { error: 'must be between 0 and 90 °C (range of the equilibrium constants)' });
