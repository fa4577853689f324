/**
 * Money for billing: whole cents (integers) with an ISO 4217 currency, so a total never
 * depends on binary floating point. Shared by the server (the record) and the client (display).
 */
export const BILLING_KINDS = ['alkalinity', 'acidity', 'speciation', 'rush'] as const;
export type BillingKind = (typeof BILLING_KINDS)[number];

export const BILLING_KIND_LABELS: Record<BillingKind, string> = {
  alkalinity: 'Alkalinity (P and T)',
  acidity: 'Acidity (mineral and total)',
  speciation: 'Full carbonate speciation',
  rush: 'Rush turnaround surcharge',
};

export const INVOICE_STATUSES = ['draft', 'open', 'paid', 'void', 'refunded'] as const;
export type InvoiceStatus = (typeof INVOICE_STATUSES)[number];
/** What a payer sees: the stored status, with `overdue` for an open invoice past its due date. */
export type InvoiceState = InvoiceStatus | 'overdue';

export const CURRENCIES = ['usd', 'cad', 'eur', 'gbp'] as const;
/** Cents in a major unit for the currencies we accept (all two-decimal). */
const MINOR_UNITS = 100;
/** Largest amount in cents one line or invoice may hold (fits an INTEGER column with room). */
export const MAX_CENTS = 1_000_000_000;

/** True for a whole, non-negative number of cents within the column's range. */
export function isCents(n: unknown): n is number {
  return typeof n === 'number' && Number.isSafeInteger(n) && n >= 0 && n <= MAX_CENTS;
}

/** count × unit price, exact in integer cents; throws past MAX_CENTS rather than round. */
export function lineAmountCents(quantity: number, unitAmountCents: number): number {
  if (!Number.isSafeInteger(quantity) || quantity < 0) throw new RangeError('quantity must be a whole number ≥ 0');
  if (!isCents(unitAmountCents)) throw new RangeError('unit amount must be whole cents');
  const amount = quantity * unitAmountCents;
  if (!isCents(amount)) throw new RangeError('line amount exceeds the largest invoice amount');
  return amount;
}

/** Sum of whole-cent amounts, exact. */
export function sumCents(amounts: readonly number[]): number {
  let total = 0;
  for (const a of amounts) {
    if (!Number.isSafeInteger(a)) throw new RangeError('amounts must be whole cents');
    total += a;
  }
  if (!isCents(total)) throw new RangeError('total exceeds the largest invoice amount');
  return total;
}

/** "1234.50" or "1,234.50" style decimal from cents, without floating point. */
export function centsToDecimal(cents: number): string {
  const sign = cents < 0 ? '-' : '';
  const abs = Math.abs(cents);
  const major = Math.floor(abs / MINOR_UNITS);
  const minor = String(abs % MINOR_UNITS).padStart(2, '0');
  return `${sign}${major}.${minor}`;
}

/** Parses "12.5", "12.50" or "12" (major units) into cents exactly; null when it is not money. */
export function decimalToCents(text: string): number | null {
  const m = /^\s*(\d{1,9})(?:\.(\d{1,2}))?\s*$/.exec(text);
  if (!m) return null;
  const cents = Number(m[1]) * MINOR_UNITS + Number((m[2] ?? '').padEnd(2, '0'));
  return isCents(cents) ? cents : null;
}

/** "US$1,234.50" for display (Intl only formats; the figure comes from integer cents). */
export function formatMoney(cents: number, currency: string, locale = 'en-US'): string {
  const [major, minor] = centsToDecimal(cents).split('.');
  const grouped = new Intl.NumberFormat(locale, { maximumFractionDigits: 0 }).format(BigInt(major.replace('-', '')));
  const symbol = new Intl.NumberFormat(locale, { style: 'currency', currency: currency.toUpperCase(), currencyDisplay: 'narrowSymbol' })
    .formatToParts(0)
    .find((p) => p.type === 'currency')?.value ?? currency.toUpperCase();
  return `${cents < 0 ? '-' : ''}${symbol}${grouped}.${minor}`;
}

/** The state to show: an open invoice whose due date (YYYY-MM-DD) is before `today` is overdue. */
export function invoiceState(status: InvoiceStatus, dueOn: string | null, today: string): InvoiceState {
  return status === 'open' && dueOn !== null && dueOn < today ? 'overdue' : status;
}

/** YYYY-MM-DD plus whole days (UTC calendar arithmetic). */
export function addDays(date: string, days: number): string {
  const d = new Date(`${date}T00:00:00Z`);
  d.setUTCDate(d.getUTCDate() + days);
  return d.toISOString().slice(0, 10);
}
