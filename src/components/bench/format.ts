import type { Analysis } from '@shared/schemas/bench';

export const MGL = 'mg/L as CaCO3';

/** A date-time in the viewer's zone, short. */
export function when(iso: string | null | undefined): string {
  if (!iso) return '—';
  return new Date(iso).toLocaleString(undefined, { year: 'numeric', month: 'short', day: 'numeric', hour: '2-digit', minute: '2-digit' });
}

/** The headline figure of a result: total alkalinity or total acidity. */
export function headline(r: { analysis: Analysis; totalAlkalinity: number | null; totalAcidity: number | null }): number | null {
  return r.analysis === 'alkalinity' ? r.totalAlkalinity : r.totalAcidity;
}

/** `<input type="datetime-local">` value for an instant, in the browser's zone. */
export function toLocalInput(iso: string | null | undefined): string {
  if (!iso) return '';
  const d = new Date(iso);
  const pad = (n: number) => String(n).padStart(2, '0');
  return `${d.getFullYear()}-${pad(d.getMonth() + 1)}-${pad(d.getDate())}T${pad(d.getHours())}:${pad(d.getMinutes())}`;
}

/** The instant (with Z) of a local date-time input; blank stays absent; junk stays text so the schema names it. */
export function fromLocalInput(v: string): string | undefined {
  if (!v) return undefined;
  const d = new Date(v);
  return Number.isNaN(d.getTime()) ? v : d.toISOString();
}

export function today(): string {
  return toLocalInput(new Date().toISOString()).slice(0, 10);
}

/** The 409 wording: someone else saved first. */
export function conflictText(e: unknown): string | null {
  const err = e as { status?: number; message?: string };
  return err?.status === 409 ? `${err.message ?? 'This result changed since you opened it.'} Reload to see the latest version, then make your change again.` : null;
}
