/**
 * Property-based: mutated plate specs (wrong types, non-finite, huge and negative numbers,
 * missing and unknown fields, deep nesting) go through parsePlateSpec and, when accepted, through
 * every computation a revision save or a quote runs. Only DomainErrors with a message may come
 * out, never NaN/Infinity, and checkPlate never throws on an accepted spec.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';

// One fixed seed per run of the suite (change FUZZ_SEED to explore); a failure prints its seed and path.
fc.configureGlobal({ seed: Number(process.env.FUZZ_SEED ?? 20261201) });
import { checkPlate, cutLength, parsePlateSpec, plateMass, plateProfile, stockSize, type PlateSpec } from '../../../src/domain';
import { domainCall, expectFinite } from './walk';

const demo = JSON.parse(readFileSync(new URL('../../../templates/plates/demo.json', import.meta.url), 'utf8'));
const blank = JSON.parse(readFileSync(new URL('../../../templates/plates/blank.json', import.meta.url), 'utf8'));

type Path = (string | number)[];
function paths(v: unknown, base: Path = [], out: Path[] = []): Path[] {
  out.push(base);
  if (Array.isArray(v)) v.forEach((x, i) => paths(x, [...base, i], out));
  else if (v && typeof v === 'object') for (const [k, x] of Object.entries(v)) paths(x, [...base, k], out);
  return out;
}
const demoPaths = paths(demo).filter((p) => p.length > 0);

function deep(n: number): unknown {
  let v: unknown = 1;
  for (let i = 0; i < n; i++) v = i % 2 ? [v] : { a: v };
  return v;
}

const weird = fc.oneof(
  fc.constantFrom(NaN, Infinity, -Infinity, -0, 1e308, -1e308, Number.MAX_SAFE_INTEGER, -1, -1000, 0, 1e-320, 2 ** 53 + 1),
  fc.double(),
  fc.integer(),
  fc.string({ maxLength: 12 }),
  fc.constantFrom('', ' ', 'NaN', 'Infinity', '1e400', '12,5', 'M8x1.25', '__proto__', 'constructor', '<script>', '\u0000'),
  fc.boolean(),
  fc.constant(null),
  fc.constant(undefined),
  fc.constant([]),
  fc.constant({}),
  fc.constant(deep(200)),
  fc.array(fc.double(), { maxLength: 5 }),
  fc.dictionary(fc.string({ maxLength: 6 }), fc.oneof(fc.double(), fc.string({ maxLength: 4 })), { maxKeys: 3 }),
);

type Mutation = { kind: 'set'; at: number; value: unknown } | { kind: 'delete'; at: number } | { kind: 'unknown'; at: number; key: string; value: unknown } | { kind: 'scale'; at: number; factor: number };

const mutation: fc.Arbitrary<Mutation> = fc.oneof(
  fc.record({ kind: fc.constant('set' as const), at: fc.nat(demoPaths.length - 1), value: weird }),
  fc.record({ kind: fc.constant('delete' as const), at: fc.nat(demoPaths.length - 1) }),
  fc.record({ kind: fc.constant('unknown' as const), at: fc.nat(demoPaths.length - 1), key: fc.string({ minLength: 1, maxLength: 8 }), value: weird }),
  // plausible numbers, wrong sizes: keeps many specs valid so the computations behind run too
  fc.record({ kind: fc.constant('scale' as const), at: fc.nat(demoPaths.length - 1), factor: fc.constantFrom(0, 0.001, 0.5, 0.9, 1.1, 2, 10, 1000, -1) }),
);

function apply(spec: any, m: Mutation): any {
  const path = demoPaths[m.at];
  let parent = spec;
  for (const k of path.slice(0, -1)) {
    if (parent === null || typeof parent !== 'object') return spec;
    parent = parent[k];
  }
  if (parent === null || typeof parent !== 'object') return spec;
  const key = path[path.length - 1];
  if (m.kind === 'set') parent[key] = m.value;
  else if (m.kind === 'delete') {
    if (Array.isArray(parent)) parent.splice(Number(key), 1);
    else delete parent[key];
  } else if (m.kind === 'unknown') {
    const target = parent[key];
    if (target && typeof target === 'object' && !Array.isArray(target)) target[m.key] = m.value;
  } else if (typeof parent[key] === 'number') parent[key] = parent[key] * m.factor;
  return spec;
}

/** Everything that runs on an accepted spec. */
function computeAll(spec: PlateSpec) {
  // checkPlate must never throw on a spec parsePlateSpec accepted
  let findings;
  try {
    findings = checkPlate(spec);
  } catch (e) {
    throw new Error(`checkPlate threw on an accepted spec: ${e instanceof Error ? e.stack : String(e)}`);
  }
  expectFinite(findings, 'checkPlate');
  for (const f of findings) expect(typeof f.message === 'string' && f.message.length > 0, 'every finding has a message').toBe(true);
  domainCall('plateProfile', () => plateProfile(spec));
  domainCall('plateMass', () => plateMass(spec));
  domainCall('stockSize', () => stockSize(spec));
  domainCall('cutLength', () => cutLength(spec));
  return findings;
}

describe('plate spec fuzz', () => {
  it('the unmutated demo parses, checks and computes (so the properties below are not vacuous)', () => {
    const spec = parsePlateSpec(structuredClone(demo));
    const findings = computeAll(spec);
    expect(Array.isArray(findings)).toBe(true);
    expect(plateMass(spec).massKg).toBeGreaterThan(0);
  });

  it('1–4 random mutations of the demo spec: a DomainError with a message, or an accepted spec every computation handles', () => {
    let accepted = 0;
    let rejected = 0;
    fc.assert(
      fc.property(fc.array(mutation, { minLength: 1, maxLength: 4 }), fc.boolean(), (ms, asText) => {
        let spec = structuredClone(demo);
        for (const m of ms) spec = apply(spec, m);
        let input: unknown = spec;
        if (asText) {
          try {
            input = JSON.stringify(spec);
          } catch {
            input = spec;
          }
        }
        const r = domainCall('parsePlateSpec', () => parsePlateSpec(input));
        if (!r.ok) {
          rejected++;
          return;
        }
        accepted++;
        computeAll(r.value);
      }),
      { numRuns: 400 },
    );
    // both branches were exercised
    expect(accepted).toBeGreaterThan(5);
    expect(rejected).toBeGreaterThan(5);
  });

  it('whole random values and broken JSON text are rejected with a message', () => {
    fc.assert(
      fc.property(fc.oneof(fc.jsonValue({ maxDepth: 4 }), fc.anything({ maxDepth: 3 }), fc.string({ maxLength: 200 }), fc.constant(deep(5000)), fc.constant(JSON.stringify(demo).slice(0, 300))), (v) => {
        const r = domainCall('parsePlateSpec', () => parsePlateSpec(v));
        if (r.ok) computeAll(r.value);
      }),
      { numRuns: 300 },
    );
  });

  it('the blank template with random top-level fields merged in', () => {
    fc.assert(
      fc.property(fc.dictionary(fc.constantFrom(...Object.keys(demo), 'extra', 'schemaVersion'), weird, { maxKeys: 4 }), (patch) => {
        const r = domainCall('parsePlateSpec', () => parsePlateSpec({ ...structuredClone(blank), ...patch }));
        if (r.ok) computeAll(r.value);
      }),
      { numRuns: 200 },
    );
  });
});
