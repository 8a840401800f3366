import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { parseDecimal } from '../../../src/domain/measure/numbers';
import { MeasureFileParser, parseMeasureFile, formatFromFileName } from '../../../src/domain/measure/formats';
import { MeasureFileError } from '../../../src/domain/measure/errors';
import { SMALL_FACE, makeFace, writePlyAscii, writePlyBinary, writeStlAscii, writeStlBinary, writeXyz } from '../../fixtures/measure/syntheticFace';

const enc = (s: string) => new TextEncoder().encode(s);
const face = makeFace(SMALL_FACE);
const n = face.points.length / 3;
const round5 = (x: number) => Math.round(x * 1e5) / 1e5;

function failure(bytes: Uint8Array, fileName: string): MeasureFileError {
  try {
    parseMeasureFile(bytes, { fileName });
  } catch (e) {
    expect(e).toBeInstanceOf(MeasureFileError);
    return e as MeasureFileError;
  }
  throw new Error(`${fileName} was accepted`);
}

describe('parseDecimal reads exactly what Number() reads', () => {
  it('for any decimal text a scanner writes', () => {
    fc.assert(
      fc.property(fc.double({ noNaN: true, noDefaultInfinity: true }), fc.integer({ min: 0, max: 17 }), fc.boolean(), (x, digits, exp) => {
        const text = exp ? x.toExponential(Math.min(digits, 16)) : Math.abs(x) < 1e21 ? x.toFixed(Math.min(digits, 12)) : x.toString();
        const bytes = enc(text);
        expect(Object.is(parseDecimal(bytes, 0, bytes.length), Number(text))).toBe(true);
      }),
      { numRuns: 3000 },
    );
  });
  it('refuses what is not a plain decimal', () => {
    for (const t of ['', '-', '.', 'nan', 'inf', '1e', '0x10', '1,5', '1.2.3', '--1', '1e+']) {
      const b = enc(t);
      expect(parseDecimal(b, 0, b.length), t).toBeNaN();
    }
  });
});

describe('every format gives the same points, whatever the chunks', () => {
  const files = [
    { name: 'f.xyz', bytes: enc(writeXyz(face.points, { header: true })), exact: round5 },
    { name: 'f.csv', bytes: enc(writeXyz(face.points, { csv: true, header: true })), exact: round5 },
    { name: 'f.ply', bytes: enc(writePlyAscii(face.points)), exact: round5 },
    { name: 'g.ply', bytes: writePlyBinary(face.points, { triangles: face.triangles }), exact: Math.fround },
    { name: 'h.ply', bytes: writePlyBinary(face.points, { double: true }), exact: (x: number) => x },
  ];
  it.each(files)('$name holds every point, value for value', ({ name, bytes, exact }) => {
    const r = parseMeasureFile(bytes, { fileName: name, chunkBytes: 4096 + 7 });
    expect(r.count).toBe(n);
    const p = r.points!;
    for (let i = 0; i < 3 * n; i++) if (p[i] !== exact(face.points[i]!)) throw new Error(`${name}: value ${i} is ${p[i]}, expected ${exact(face.points[i]!)}`);
    expect(r.bbox.min.x).toBe(Math.min(...Array.from(p.filter((_, i) => i % 3 === 0))));
  });

  it('any split into chunks gives the same result (all formats)', () => {
    const small = face.points.subarray(0, 3 * 60);
    const tri = Uint32Array.from([0, 1, 2, 2, 3, 4, 4, 5, 0, 10, 11, 12]);
    const cases = [
      { name: 'a.xyz', bytes: enc('# scan\r\n' + writeXyz(small).replace(/\n/g, '\r\n')) },
      { name: 'a.csv', bytes: enc(writeXyz(small, { csv: true, header: true, labels: (i) => (i % 7 === 0 ? `H${i % 3}` : null) })) },
      { name: 'a.ply', bytes: enc(writePlyAscii(small)) },
      { name: 'b.ply', bytes: writePlyBinary(small) },
      { name: 'a.stl', bytes: enc(writeStlAscii(small, tri)) },
      { name: 'b.stl', bytes: writeStlBinary(small, tri) },
    ];
    for (const c of cases) {
      const whole = parseMeasureFile(c.bytes, { fileName: c.name, chunkBytes: c.bytes.length });
      fc.assert(
        fc.property(fc.array(fc.integer({ min: 1, max: c.bytes.length }), { minLength: 1, maxLength: 12 }), (cuts) => {
          const parser = new MeasureFileParser({ fileName: c.name });
          const at = [...new Set(cuts)].sort((a, b) => a - b);
          let from = 0;
          for (const cut of [...at, c.bytes.length]) {
            parser.push(c.bytes.subarray(from, cut));
            from = cut;
          }
          const r = parser.end();
          expect(r.count).toBe(whole.count);
          expect(Array.from(r.points!)).toEqual(Array.from(whole.points!));
          expect(r.labels).toEqual(whole.labels);
        }),
        { numRuns: 60 },
      );
    }
  });

  it('an STL gives each vertex once, ASCII and binary alike', () => {
    const used = new Set(Array.from(face.triangles)).size;
    const b = parseMeasureFile(writeStlBinary(face.points, face.triangles), { fileName: 'm.stl' });
    expect(b.encoding).toBe('binary');
    expect(b.triangleCount).toBe(face.triangles.length / 3);
    expect(b.count).toBe(used);
    const part = face.triangles.subarray(0, 3000);
    const a = parseMeasureFile(enc(writeStlAscii(face.points, part)), { fileName: 'm.stl' });
    expect(a.encoding).toBe('ascii');
    expect(a.count).toBe(new Set(Array.from(part)).size);
  });

  it('a binary STL whose header starts with "solid" is still read as binary', () => {
    const bytes = writeStlBinary(face.points, face.triangles.subarray(0, 30));
    bytes.set(enc('solid but binary'), 0);
    const r = parseMeasureFile(bytes, { fileName: 's.stl' });
    expect(r.encoding).toBe('binary');
    expect(r.triangleCount).toBe(10);
  });

  it('keeps the labels of a probed CSV, and units named in a header', () => {
    const r = parseMeasureFile(enc('X [mm];Y [mm];Z [mm];label\n1;2;3;H1\n4;5;6;H2\n7;8;9;H1\n1;1;1;\n'), { fileName: 'probe.csv' });
    expect(r.labels).toEqual(['H1', 'H2']);
    expect(Array.from(r.labelIndex!)).toEqual([1, 2, 1, 0]);
    expect(r.unitsFromHeader).toBe('mm');
  });
});

describe('bad files say where they are wrong', () => {
  it('text: line and column', () => {
    const e = failure(enc('1 2 3\n4 5 6\n\n# note\n7 8 x9\n'), 'a.xyz');
    expect(e.code).toBe('measure.badNumber');
    expect(e.line).toBe(5);
    expect(e.byteOffset).toBe(enc('1 2 3\n4 5 6\n\n# note\n7 8 ').length);
    expect(e.message).toBe('Line 5, column 3: "x9" is not a number.');
    expect(failure(enc('1 2 3\n1 inf 3\n'), 'a.xyz').code).toBe('measure.nonFinite');
    expect(failure(enc('1,,3\n'), 'a.csv').message).toMatch(/Line 1, column 2 is empty/);
  });
  it('binary: byte offsets', () => {
    const ply = writePlyBinary(face.points.subarray(0, 30));
    const head = ply.length - 10 * 13;
    new DataView(ply.buffer).setFloat32(head + 13 * 4 + 8, Infinity, true);
    const e = failure(ply, 'a.ply');
    expect(e.code).toBe('measure.nonFinite');
    expect(e.byteOffset).toBe(head + 13 * 4 + 8);
    expect(e.message).toMatch(/^Vertex 4 \(byte \d+\) has z = Infinity/);
    const stl = writeStlBinary(face.points, face.triangles.subarray(0, 30));
    const cut = failure(stl.subarray(0, 84 + 50 * 3 + 10), 'a.stl');
    expect(cut.code).toBe('measure.truncated');
    expect(cut.byteOffset).toBe(84 + 50 * 3 + 10);
    const extra = new Uint8Array(stl.length + 5);
    extra.set(stl);
    expect(failure(extra, 'a.stl').message).toMatch(/5 bytes after the 10 triangles/);
  });
  it('more points than the limit: tooManyPoints, before reading them all', () => {
    const parser = new MeasureFileParser({ fileName: 'a.xyz', maxPoints: 5 });
    // the first push is past the format check (512 bytes), so the limit is met while reading
    expect(() => parser.push(enc('1 2 3\n'.repeat(1000)))).toThrow(/more than 5 points.*at line 6/);
  });
  it('names only the formats it knows', () => {
    expect(formatFromFileName('Scan.PLY')).toBe('ply');
    expect(formatFromFileName('points.txt')).toBe('xyz');
    expect(formatFromFileName('mesh.obj')).toBeNull();
  });
});

describe('committed samples', () => {
  it('are exactly what scripts/make-measure-fixtures.ts makes, and each one reads', async () => {
    const { readFileSync } = await import('node:fs');
    const { measureSamples } = await import('../../fixtures/measure/samples');
    for (const [name, bytes] of Object.entries(measureSamples())) {
      const committed = new Uint8Array(readFileSync(new URL(`../../fixtures/measure/samples/${name}`, import.meta.url)));
      expect(committed.length, name).toBe(bytes.length);
      expect(Buffer.compare(Buffer.from(committed), Buffer.from(bytes)), `${name} differs from the generator: run npx tsx scripts/make-measure-fixtures.ts`).toBe(0);
      const r = parseMeasureFile(committed, { fileName: name });
      expect(r.count, name).toBeGreaterThan(name.startsWith('probe') ? 60 : name.includes('patch') ? 200 : 1000);
    }
  });
});
