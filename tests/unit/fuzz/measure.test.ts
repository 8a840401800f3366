/**
 * Property-based: upload bytes for the measurement parsers. Valid files of every format are
 * mutated (bytes flipped, inserted, cut short), random bytes are given valid names, and every
 * result is fed in random chunk sizes. A parsed cloud without NaN/Infinity (and its summary),
 * or a DomainError with a message — never another exception.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';

// One fixed seed per run of the suite (change FUZZ_SEED to explore); a failure prints its seed and path.
fc.configureGlobal({ seed: Number(process.env.FUZZ_SEED ?? 20261201) });
import { parseMeasureFile } from '../../../src/domain/measure/formats';
import { uploadSummary } from '../../../src/domain/measure/summary';
import { domainCall } from './walk';

const enc = new TextEncoder();
const pts = [
  [0, 0, 0],
  [10.5, 0, 0.01],
  [0, 12.25, -0.02],
  [7, 7, 0],
  [-3.5, 4, 0.003],
];
function binaryPly(): Uint8Array {
  const header = enc.encode(`ply\nformat binary_little_endian 1.0\nelement vertex ${pts.length}\nproperty float x\nproperty float y\nproperty float z\nend_header\n`);
  const body = new DataView(new ArrayBuffer(pts.length * 12));
  pts.forEach((p, i) => p.forEach((c, j) => body.setFloat32(i * 12 + j * 4, c, true)));
  const out = new Uint8Array(header.length + body.byteLength);
  out.set(header);
  out.set(new Uint8Array(body.buffer), header.length);
  return out;
}
function binaryStl(): Uint8Array {
  const tris = [
    [pts[0], pts[1], pts[2]],
    [pts[1], pts[3], pts[2]],
  ];
  const b = new DataView(new ArrayBuffer(84 + tris.length * 50));
  b.setUint32(80, tris.length, true);
  tris.forEach((t, i) => {
    const o = 84 + i * 50;
    t.forEach((p, k) => p.forEach((c, j) => b.setFloat32(o + 12 + k * 12 + j * 4, c, true)));
  });
  return new Uint8Array(b.buffer);
}
const seeds: { name: string; bytes: Uint8Array }[] = [
  { name: 'face.xyz', bytes: enc.encode(pts.map((p) => p.join(' ')).join('\n') + '\n') },
  { name: 'face.csv', bytes: enc.encode('x,y,z\n' + pts.map((p) => p.join(',')).join('\n') + '\n') },
  { name: 'probe.csv', bytes: enc.encode('label;x;y;z\n' + pts.map((p, i) => `H${i};${p.join(';')}`).join('\n') + '\n') },
  { name: 'face.ply', bytes: enc.encode(`ply\nformat ascii 1.0\nelement vertex ${pts.length}\nproperty float x\nproperty float y\nproperty float z\nend_header\n` + pts.map((p) => p.join(' ')).join('\n') + '\n') },
  { name: 'bin.ply', bytes: binaryPly() },
  { name: 'mesh.stl', bytes: enc.encode(`solid face\nfacet normal 0 0 1\nouter loop\n${pts.slice(0, 3).map((p) => `vertex ${p.join(' ')}`).join('\n')}\nendloop\nendfacet\nendsolid face\n`) },
  { name: 'bin.stl', bytes: binaryStl() },
];

type Edit = { kind: 'flip'; at: number; byte: number } | { kind: 'insert'; at: number; text: string } | { kind: 'cut'; at: number } | { kind: 'dup'; at: number; len: number };
const edit: fc.Arbitrary<Edit> = fc.oneof(
  fc.record({ kind: fc.constant('flip' as const), at: fc.nat(), byte: fc.integer({ min: 0, max: 255 }) }),
  fc.record({ kind: fc.constant('insert' as const), at: fc.nat(), text: fc.oneof(fc.string({ maxLength: 8 }), fc.constantFrom('NaN', 'inf', '-Infinity', '1e400', '1e308', ' ', '\n', '\r\n', ',', '\u0000', 'element vertex 999999999\n', 'end_header\n', '99999999999999999999')) }),
  fc.record({ kind: fc.constant('cut' as const), at: fc.nat() }),
  fc.record({ kind: fc.constant('dup' as const), at: fc.nat(), len: fc.integer({ min: 1, max: 200 }) }),
);
function applyEdit(b: Uint8Array, e: Edit): Uint8Array {
  const at = b.length ? e.at % (b.length + 1) : 0;
  if (e.kind === 'flip') {
    if (!b.length) return b;
    const c = b.slice();
    c[at % b.length] = e.byte;
    return c;
  }
  if (e.kind === 'cut') return b.slice(0, at);
  const ins = e.kind === 'insert' ? enc.encode(e.text) : b.slice(at, at + e.len);
  const c = new Uint8Array(b.length + ins.length);
  c.set(b.subarray(0, at));
  c.set(ins, at);
  c.set(b.subarray(at), at + ins.length);
  return c;
}

function parseBoth(bytes: Uint8Array, fileName: string, chunkBytes: number) {
  const r = domainCall(`parseMeasureFile(${fileName})`, () => parseMeasureFile(bytes, { fileName, chunkBytes, maxPoints: 100_000 }));
  if (r.ok) {
    expect(r.value.count).toBeGreaterThanOrEqual(0);
    for (const units of ['mm', 'in'] as const) domainCall('uploadSummary', () => uploadSummary(r.value, units));
    // the same bytes in another chunking give the same cloud (or the same refusal)
    const whole = parseMeasureFile(bytes, { fileName, chunkBytes: bytes.length || 1, maxPoints: 100_000 });
    expect(whole.count).toBe(r.value.count);
  }
  return r;
}

describe('measurement parser fuzz', () => {
  it('every seed file parses (so the mutations start from accepted files)', () => {
    for (const s of seeds) {
      const r = parseBoth(s.bytes, s.name, 7);
      expect(r.ok, `${s.name}: ${r.ok ? '' : r.error.message}`).toBe(true);
    }
  });

  it('mutated files in random chunks: a finite cloud or a DomainError with a message', () => {
    let ok = 0;
    let refused = 0;
    fc.assert(
      fc.property(fc.nat(seeds.length - 1), fc.array(edit, { minLength: 1, maxLength: 4 }), fc.integer({ min: 1, max: 600 }), (i, edits, chunk) => {
        let b = seeds[i]!.bytes;
        for (const e of edits) b = applyEdit(b, e);
        const r = parseBoth(b, seeds[i]!.name, chunk);
        if (r.ok) ok++;
        else refused++;
      }),
      { numRuns: 1500 },
    );
    expect(ok).toBeGreaterThan(30);
    expect(refused).toBeGreaterThan(30);
  });

  it('random bytes under every accepted name (and odd names) are answered with a DomainError or a finite cloud', () => {
    fc.assert(
      fc.property(
        fc.oneof(fc.uint8Array({ maxLength: 2000 }), fc.string({ maxLength: 400 }).map((s) => enc.encode(s))),
        fc.constantFrom('a.xyz', 'a.txt', 'a.asc', 'a.pts', 'a.csv', 'a.ply', 'a.stl', 'A.STL', 'noext', '', '.ply', 'x.exe', 'a.ply ', 'ä.csv'),
        fc.integer({ min: 1, max: 3000 }),
        (bytes, name, chunk) => {
          parseBoth(bytes, name, chunk);
        },
      ),
      { numRuns: 800 },
    );
  });
});

describe('measurement coordinate range', () => {
  it('a coordinate of 1e308 is refused with its line instead of an Infinity box in inches (found by the fuzz above)', () => {
    // 1e308 in × 25.4 = 2.54e309 > double max ≈ 1.8e308 → Infinity (IEEE 754)
    const r = domainCall('parseMeasureFile', () => parseMeasureFile(enc.encode('0 0 0\n1 1e308 0\n2 0 0\n'), { fileName: 'big.xyz' }));
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.error.message).toMatch(/line 2/);
  });
});
