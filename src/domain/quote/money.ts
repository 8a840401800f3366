/**
 * Money in integer minor units (cents), and the one rounding rule of quoting:
 * HALF-UP to a whole minor unit, applied once per line (0.5 cent → 1 cent, 0.49 → 0).
 * Amounts are never negative before rounding except discounts, which are rounded as positive
 * amounts and then subtracted, so "half-up" always means "half away from zero".
 */
import { DomainError } from '../errors';

/**
 * Round a non-negative exact amount (in minor units, possibly fractional) half-up to a whole
 * minor unit. The value is first snapped to 1e-6 minor units so that binary floating-point
 * noise (1.005 × 100 = 100.49999…) does not turn an exact half into a round-down.
 */
export function roundHalfUpMinor(exactMinor: number): number {
  if (!Number.isFinite(exactMinor) || exactMinor < 0) {
    throw new DomainError('quote.money', `an amount to round must be a finite number of 0 or more minor units, got ${exactMinor}`);
  }
  const snapped = Math.round(exactMinor * 1e6) / 1e6;
  return Math.floor(snapped + 0.5);
}

/** n × bp / 10 000, half-up, in integer arithmetic (n and bp whole and ≥ 0). */
export function basisPointsOf(amountMinor: number, bp: number): number {
  if (!Number.isSafeInteger(amountMinor) || amountMinor < 0 || !Number.isSafeInteger(bp) || bp < 0) {
    throw new DomainError('quote.money', `basis points need whole non-negative numbers, got ${amountMinor} × ${bp} bp`);
  }
  const num = amountMinor * bp;
  if (!Number.isSafeInteger(num * 2 + 10_000)) throw new DomainError('quote.money', 'amount too large to compute exactly');
  // floor((2·num + d) / 2d) = round half-up of num / d, d = 10 000
  return Math.floor((2 * num + 10_000) / 20_000);
}

/** "1234.50" for 123450 minor units with 2 digits (no symbol, no grouping: for arithmetic text). */
export function minorToDecimal(minor: number, digits: number): string {
  const neg = minor < 0;
  const abs = Math.abs(minor);
  if (digits === 0) return (neg ? '-' : '') + String(abs);
  const s = String(abs).padStart(digits + 1, '0');
  return (neg ? '-' : '') + s.slice(0, -digits) + '.' + s.slice(-digits);
}

/** Display form with the currency's symbol, e.g. "€1,234.50". */
export function formatMoney(minor: number, currency: string, digits: number): string {
  try {
    return new Intl.NumberFormat('en-GB', { style: 'currency', currency, minimumFractionDigits: digits, maximumFractionDigits: digits }).format(minor / 10 ** digits);
  } catch {
    return `${minorToDecimal(minor, digits)} ${currency}`;
  }
}

/** Basis points as a percentage text: 1900 → "19 %", 1250 → "12.5 %". */
export function bpToPercent(bp: number): string {
  return `${Number((bp / 100).toFixed(2))} %`;
}

/**
 * "9.50" / "9,50" / "12" → minor units (950 / 950 / 1200) without floating point; null when the
 * text is not a plain amount with at most `digits` decimals.
 */
export function decimalToMinor(text: string, digits: number): number | null {
  const m = /^\s*(\d{1,12})(?:[.,](\d*))?\s*$/.exec(text);
  if (!m) return null;
  const frac = m[2] ?? '';
  if (frac.length > digits) return null;
  return Number(m[1]) * 10 ** digits + Number((frac + '0'.repeat(digits)).slice(0, digits) || '0');
}
