import { readdirSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { checkPlate, countFindings } from '../../../src/domain/checks';
import { plateMass } from '../../../src/domain/mass';
import { plateProfile } from '../../../src/domain/profile';
import { plateSpecSchema } from '../../../src/domain/spec';

const dir = fileURLToPath(new URL('../../../templates/plates/', import.meta.url));
const files = readdirSync(dir).filter((f) => f.endsWith('.json')).sort();
const load = (name: string): unknown => JSON.parse(readFileSync(`${dir}${name}`, 'utf8'));
const IN = 25.4;

describe('starting plate templates', () => {
  it('has the blank plate, the demo plate and one per SAE J617 size', () => {
    expect(files).toContain('blank.json');
    expect(files).toContain('demo.json');
    // SAE J617 sizes 00, 0, 1/2, 1 … 6 (REFERENCES.md)
    for (const size of ['00', '0', '1-2', '1', '2', '3', '4', '5', '6']) expect(files).toContain(`sae-j617-${size}.json`);
  });

  for (const name of files) {
    it(`${name} parses with plateSpecSchema and makes a plate`, () => {
      const r = plateSpecSchema.safeParse(load(name));
      expect(r.success, r.success ? '' : JSON.stringify(r.error.issues)).toBe(true);
      const profile = plateProfile(r.data!);
      expect(profile.outline.length).toBeGreaterThan(0);
      expect(countFindings(checkPlate(r.data!)).error).toBe(0);
    });
  }

  it('the demo plate: ~330 × 300 mm, 12.7 mm 6061-T6, two dowels per face, no errors', () => {
    const spec = plateSpecSchema.parse(load('demo.json'));
    const p = plateProfile(spec);
    const w = p.bbox.maxX - p.bbox.minX;
    const h = p.bbox.maxY - p.bbox.minY;
    expect(w).toBeGreaterThan(300);
    expect(w).toBeLessThan(360);
    expect(h).toBeGreaterThan(280);
    expect(h).toBeLessThan(340);
    expect(spec.thicknessMm).toBeCloseTo(0.5 * IN, 12);
    expect(spec.engineFace.holes.filter((x) => x.role === 'dowel')).toHaveLength(2);
    expect(spec.transmissionFace.holes.filter((x) => x.role === 'dowel')).toHaveLength(2);
    expect(p.holes.find((x) => x.id === 'C1')?.diameterMm).toBe(90);
    expect(p.pockets).toHaveLength(1);
    const counts = countFindings(checkPlate(spec));
    expect(counts.error).toBe(0);
    expect(counts.warning).toBeLessThanOrEqual(2);
    expect(counts.note).toBeGreaterThan(3);
    // a few kg of aluminium: 6061 at 2.70 g/cm³ (Aluminum Association)
    const m = plateMass(spec);
    expect(m.exact).toBe(true);
    expect(m.massKg).toBeGreaterThan(1.5);
    expect(m.massKg).toBeLessThan(3.5);
  });

  it('SAE J617 size 3 template carries the published pattern: 12 × 3/8-16 on 16.875 in, bore 16.125/16.130 in', () => {
    const spec = plateSpecSchema.parse(load('sae-j617-3.json'));
    const pattern = spec.transmissionFace.patterns[0]!;
    // SAE J617 table (REFERENCES.md)
    expect(pattern.diameterMm).toBeCloseTo(16.875 * IN, 9);
    expect(pattern.count).toBe(12);
    // 12 holes straddle the vertical: first one 15° off it, from memory
    expect(pattern.startAngleDeg).toBeCloseTo(75, 12);
    expect(spec.transmissionFace.holes.every((x) => x.fastener === '3/8-16 UNC')).toBe(true);
    expect(spec.centreBore.limitsMm?.lowerMm).toBeCloseTo(16.125 * IN, 9);
    expect(spec.centreBore.limitsMm?.upperMm).toBeCloseTo(16.13 * IN, 9);
    // runout TIR for bores 14¼–20⅛ in: 0.008 in (SAE housing runout table)
    expect(spec.tolerances.alignmentTirMm).toBeCloseTo(0.008 * IN, 9);
  });

  it('SAE J617 size 6 template: 8 × 3/8-16 on 11.250 in, bore 10.500 in', () => {
    const spec = plateSpecSchema.parse(load('sae-j617-6.json'));
    expect(spec.transmissionFace.patterns[0]!.diameterMm).toBeCloseTo(11.25 * IN, 9);
    expect(spec.transmissionFace.holes).toHaveLength(8);
    // 8-hole housings start 22.5° off vertical (J617 reprints)
    expect(spec.transmissionFace.patterns[0]!.startAngleDeg).toBeCloseTo(67.5, 12);
    expect(spec.centreBore.diameterMm).toBeCloseTo(10.5 * IN, 9);
  });
});
