/**
 * Decimal numbers straight from bytes, without making a string per value.
 *
 * Fast path: up to 15 significant digits and a power of ten up to 22 — both the digits and the
 * power are exact doubles, so one multiplication or division is correctly rounded and the result
 * is the same double `Number(text)` gives. Anything else (more digits, large exponents) falls
 * back to `Number()` on the token's text, so every value is exactly what JavaScript would read.
 */

const POW10 = new Float64Array(23);
for (let i = 0, p = 1; i < 23; i++, p *= 10) POW10[i] = p;

const C_PLUS = 43;
const C_MINUS = 45;
const C_DOT = 46;
const C_0 = 48;
const C_9 = 57;
const C_E = 69;
const C_e = 101;

function slowParse(bytes: Uint8Array, start: number, end: number): number {
  let s = '';
  for (let i = start; i < end; i++) s += String.fromCharCode(bytes[i]!);
  // Number('') is 0 and Number('0x10') is 16: only plain decimal text may get here
  if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(s)) return NaN;
  return Number(s);
}

/**
 * Reads bytes[start, end) as a decimal number (`-12.5`, `1e-3`, `.5`, `+3.`). Returns NaN when
 * the token is not a plain decimal number (letters, `nan`, `inf`, hex, empty).
 */
export function parseDecimal(bytes: Uint8Array, start: number, end: number): number {
  let i = start;
  if (i >= end) return NaN;
  let negative = false;
  const first = bytes[i]!;
  if (first === C_MINUS || first === C_PLUS) {
    negative = first === C_MINUS;
    i++;
  }
  let mantissa = 0;
  let significant = 0;
  let scale = 0;
  let seenDigit = false;
  for (; i < end; i++) {
    const c = bytes[i]!;
    if (c < C_0 || c > C_9) break;
    seenDigit = true;
    if (significant > 0 || c !== C_0) significant++;
    mantissa = mantissa * 10 + (c - C_0);
  }
  if (i < end && bytes[i] === C_DOT) {
    i++;
    for (; i < end; i++) {
      const c = bytes[i]!;
      if (c < C_0 || c > C_9) break;
      seenDigit = true;
      if (significant > 0 || c !== C_0) significant++;
      mantissa = mantissa * 10 + (c - C_0);
      scale--;
    }
  }
  if (!seenDigit) return NaN;
  if (i < end && (bytes[i] === C_E || bytes[i] === C_e)) {
    i++;
    let expNegative = false;
    if (i < end && (bytes[i] === C_MINUS || bytes[i] === C_PLUS)) {
      expNegative = bytes[i] === C_MINUS;
      i++;
    }
    let exp = 0;
    let expDigits = 0;
    for (; i < end; i++) {
      const c = bytes[i]!;
      if (c < C_0 || c > C_9) break;
      if (exp < 100000) exp = exp * 10 + (c - C_0);
      expDigits++;
    }
    if (expDigits === 0) return NaN;
    scale += expNegative ? -exp : exp;
  }
  if (i !== end) return NaN;
  if (significant > 15 || scale < -22 || scale > 22) return slowParse(bytes, start, end);
  const magnitude = scale >= 0 ? mantissa * POW10[scale]! : mantissa / POW10[-scale]!;
  return negative ? -magnitude : magnitude;
}

/** The token as text (for messages), shortened to 40 characters. */
export function tokenText(bytes: Uint8Array, start: number, end: number): string {
  let s = '';
  const stop = Math.min(end, start + 40);
  for (let i = start; i < stop; i++) {
    const c = bytes[i]!;
    s += c >= 32 && c < 127 ? String.fromCharCode(c) : `\\x${c.toString(16).padStart(2, '0')}`;
  }
  return end - start > 40 ? s + '…' : s;
}
