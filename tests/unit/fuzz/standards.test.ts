/**
 * Property-based: typed-in lengths, thread names and fit classes. Either a finite value or a
 * DomainError with a message; valid inputs from the tables keep working under the same harness.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';

// One fixed seed per run of the suite (change FUZZ_SEED to explore); a failure prints its seed and path.
fc.configureGlobal({ seed: Number(process.env.FUZZ_SEED ?? 20261201) });
import {
  CLEARANCE_CLASSES,
  METRIC_NOMINALS,
  TAP_DRILL_THREADS,
  UNIFIED_NOMINALS,
  clearanceHoleMm,
  isoFit,
  isoTolerance,
  parseFastener,
  parseLength,
  tapDrillMm,
  type ClearanceClass,
} from '../../../src/domain';
import { domainCall } from './walk';

const lengthText = fc.oneof(
  fc.string({ maxLength: 20 }),
  fc.double().map(String),
  fc.tuple(fc.integer({ min: -5, max: 100 }), fc.integer({ min: 0, max: 64 }), fc.integer({ min: -1, max: 64 })).map(([a, b, c]) => `${a} ${b}/${c}`),
  fc.tuple(fc.double({ min: -1e6, max: 1e6, noNaN: true }), fc.constantFrom('', 'mm', 'in', 'inch', '"', ' mm', 'MM', 'cm', 'ft', 'µm')).map(([n, u]) => `${n}${u}`),
  fc.constantFrom('', ' ', '-', '.', '1/0', '0/0', '1e309', '-1e309', '1e-400', 'Infinity', 'NaN', '1,5', '1,500', '3/8', '1-1/4', '1 1/4', '--1', '+.5', '½', '1/2/3', '9'.repeat(400), '0x10'),
);

const threadText = fc.oneof(
  fc.string({ maxLength: 16 }),
  fc.constantFrom(...METRIC_NOMINALS, ...UNIFIED_NOMINALS, ...TAP_DRILL_THREADS),
  fc.tuple(fc.constantFrom('M', 'm', '#', ''), fc.double({ noNaN: false }), fc.constantFrom('', 'x', 'X', '×', '-'), fc.oneof(fc.double(), fc.integer())).map((p) => p.join('')),
  fc.tuple(fc.integer({ min: -3, max: 40 }), fc.integer({ min: -1, max: 40 }), fc.integer({ min: -1, max: 100 }), fc.constantFrom('', ' UNC', ' UNF', ' UNEF', ' BSW')).map(([a, b, c, s]) => `${a}/${b}-${c}${s}`),
  fc.constantFrom('M0', 'M-8', 'M8x0', 'M8x-1', 'M8x1e400', 'MNaN', 'M1e308', '0-80', '#0-80', '1/0-16', '3/8-0', 'M8x1.25x2'),
);

const classText = fc.oneof(
  { weight: 1, arbitrary: fc.string({ maxLength: 5 }) },
  { weight: 4, arbitrary: fc.constantFrom('H5', 'H6', 'H7', 'H8', 'g6', 'h6', 'k6', 'm6', 'n6', 'p6', 'h7', 'g5') },
  { weight: 1, arbitrary: fc.tuple(fc.constantFrom('H', 'h', 'g', 'k', 'm', 'n', 'p', 'G', 'Z', 'js', ''), fc.integer({ min: -2, max: 30 })).map(([l, g]) => `${l}${g}`) },
  { weight: 1, arbitrary: fc.constantFrom('H', '7', 'H07', 'H7.5', 'h-1', 'HH7', ' H7', 'h7 ') },
);

const nominal = fc.oneof(
  { weight: 1, arbitrary: fc.double() },
  { weight: 1, arbitrary: fc.constantFrom(0, -10, 1, 3, 3.0000001, 500, 500.0001, 1e9, NaN, Infinity) },
  { weight: 4, arbitrary: fc.double({ min: 0.1, max: 500, noNaN: true }) },
);

describe('standards fuzz', () => {
  it('parseLength: a finite number or a DomainError with a message', () => {
    let parsed = 0;
    fc.assert(
      fc.property(lengthText, fc.constantFrom('mm', 'in', 'cm', '' as never), (text, unit) => {
        const r = domainCall('parseLength', () => parseLength(text, unit as 'mm'));
        if (r.ok) {
          parsed++;
          expect(typeof r.value).toBe('number');
        }
      }),
      { numRuns: 1500 },
    );
    expect(parsed).toBeGreaterThan(50);
    // non-string input from an untyped caller (JSON) is refused the same way
    for (const bad of [null, undefined, 12, {}, [], true, { toString: () => '12' }]) domainCall('parseLength', () => parseLength(bad as never, 'mm'));
  });

  it('parseFastener, tapDrillMm, clearanceHoleMm: finite results or DomainErrors', () => {
    let ok = 0;
    fc.assert(
      fc.property(threadText, fc.oneof(fc.constantFrom(...CLEARANCE_CLASSES), fc.string({ maxLength: 6 })), (thread, cls) => {
        const f = domainCall('parseFastener', () => parseFastener(thread));
        const t = domainCall('tapDrillMm', () => tapDrillMm(thread));
        const c = domainCall('clearanceHoleMm', () => clearanceHoleMm(thread, cls as ClearanceClass));
        if (t.ok) expect(t.value).toBeGreaterThan(0);
        if (c.ok) expect(c.value).toBeGreaterThan(0);
        if (f.ok || t.ok || c.ok) ok++;
      }),
      { numRuns: 1500 },
    );
    expect(ok).toBeGreaterThan(50);
    for (const bad of [null, undefined, 8, {}, [], false]) {
      domainCall('parseFastener', () => parseFastener(bad as never));
      domainCall('tapDrillMm', () => tapDrillMm(bad as never));
      domainCall('clearanceHoleMm', () => clearanceHoleMm(bad as never, 'medium'));
    }
  });

  it('isoFit / isoTolerance: finite limits (lower ≤ upper) or DomainErrors', () => {
    let ok = 0;
    fc.assert(
      fc.property(nominal, classText, classText, (mm, hole, shaft) => {
        const fit = domainCall('isoFit', () => isoFit(mm, hole, shaft));
        const tol = domainCall('isoTolerance', () => isoTolerance(mm, hole));
        if (tol.ok) expect(tol.value.lowerUm).toBeLessThanOrEqual(tol.value.upperUm);
        if (fit.ok) ok++;
      }),
      { numRuns: 2000 },
    );
    expect(ok).toBeGreaterThan(20);
    for (const bad of [null, undefined, 7, {}]) domainCall('isoFit', () => isoFit(10, bad as never, 'g6'), { untypedInput: true });
  });
});
