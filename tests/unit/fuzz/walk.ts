/**
 * Helpers for the property-based tests: walk a returned value for non-finite numbers, and run
 * a call expecting either a value or a DomainError with a message — never anything else.
 */
import { DomainError } from '../../../src/domain';

/** Every place in `value` (objects, arrays, typed arrays, maps) that holds NaN or ±Infinity. */
export function nonFinitePaths(value: unknown, path = '$', seen = new Set<unknown>(), out: string[] = []): string[] {
  if (out.length > 20) return out;
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) out.push(`${path} = ${value}`);
    return out;
  }
  if (value === null || typeof value !== 'object') return out;
  if (seen.has(value)) return out;
  seen.add(value);
  if (ArrayBuffer.isView(value)) {
    if (value instanceof Float64Array || value instanceof Float32Array) {
      for (let i = 0; i < value.length; i++) if (!Number.isFinite(value[i])) out.push(`${path}[${i}] = ${value[i]}`);
    }
    return out;
  }
  if (value instanceof Map) {
    for (const [k, v] of value) nonFinitePaths(v, `${path}.get(${String(k)})`, seen, out);
    return out;
  }
  if (Array.isArray(value)) {
    value.forEach((v, i) => nonFinitePaths(v, `${path}[${i}]`, seen, out));
    return out;
  }
  for (const [k, v] of Object.entries(value)) nonFinitePaths(v, `${path}.${k}`, seen, out);
  return out;
}

export function expectFinite(value: unknown, what: string): void {
  const bad = nonFinitePaths(value);
  if (bad.length) throw new Error(`${what} returned non-finite numbers: ${bad.slice(0, 5).join(', ')}`);
}

export type Outcome<T> = { ok: true; value: T } | { ok: false; error: DomainError };

/**
 * Runs `fn`: a returned value is walked for NaN/Infinity; a DomainError must carry a non-empty
 * message and code; anything else thrown (TypeError, RangeError, a bare string …) fails.
 */
export function domainCall<T>(what: string, fn: () => T, opts: { untypedInput?: boolean } = {}): Outcome<T> {
  let value: T;
  try {
    value = fn();
  } catch (e) {
    if (!(e instanceof DomainError)) {
      throw new Error(`${what} threw something other than a DomainError: ${e instanceof Error ? `${e.name}: ${e.message}\n${e.stack}` : String(e)}`);
    }
    if (typeof e.message !== 'string' || e.message.trim() === '') throw new Error(`${what} threw a DomainError without a message (code ${e.code})`);
    if (typeof e.code !== 'string' || e.code === '') throw new Error(`${what} threw a DomainError without a code`);
    if (!opts.untypedInput && /\[object Object\]/.test(e.message)) throw new Error(`${what}: the message shows an internal value: ${e.message}`);
    return { ok: false, error: e };
  }
  expectFinite(value, what);
  return { ok: true, value };
}
