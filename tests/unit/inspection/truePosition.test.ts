import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { positionDeviation, truePositionMm, withinZone } from '../../../src/domain/inspection';
import { DomainError } from '../../../src/domain/errors';

// True position in the diameter-zone form TP = 2·√(Δx² + Δy²) (ASME Y14.5; REFERENCES.md "True position").
describe('true position, worked by hand', () => {
  it('Δx 0.03, Δy 0.04 → 2·√(0.0009 + 0.0016) = 2·√0.0025 = 2·0.05 = 0.10', () => {
    expect(truePositionMm(0.03, 0.04)).toBeCloseTo(0.1, 12);
  });
  it('nominal (119.543, 10.459), measured (119.593, 10.339): Δx +0.050, Δy −0.120 → 2·√(0.0025 + 0.0144) = 2·√0.0169 = 2·0.13 = 0.26', () => {
    const d = positionDeviation({ x: 119.543, y: 10.459 }, { x: 119.593, y: 10.339 });
    expect(d.dxMm).toBeCloseTo(0.05, 9);
    expect(d.dyMm).toBeCloseTo(-0.12, 9);
    expect(d.truePositionMm).toBeCloseTo(0.26, 9);
  });
  it('only Δy −0.025 → 2·0.025 = 0.050; on-nominal → 0', () => {
    expect(truePositionMm(0, -0.025)).toBeCloseTo(0.05, 12);
    expect(truePositionMm(0, 0)).toBe(0);
  });
  it('a Ø0.10 zone holds TP 0.10 exactly and not 0.1001', () => {
    expect(withinZone(truePositionMm(0.03, 0.04), 0.1)).toBe(true);
    expect(withinZone(truePositionMm(0.03, 0.04005), 0.1)).toBe(false);
  });
  it('refuses non-numbers with a DomainError, never NaN', () => {
    expect(() => truePositionMm(Number.NaN, 0)).toThrow(DomainError);
  });
});

describe('true position, properties', () => {
  const dev = fc.double({ min: -5, max: 5, noNaN: true });
  it('rotating the deviation vector about the nominal leaves TP unchanged', () => {
    fc.assert(
      fc.property(dev, dev, fc.double({ min: -720, max: 720, noNaN: true }), (dx, dy, angleDeg) => {
        const a = (angleDeg * Math.PI) / 180;
        const rx = dx * Math.cos(a) - dy * Math.sin(a);
        const ry = dx * Math.sin(a) + dy * Math.cos(a);
        expect(truePositionMm(rx, ry)).toBeCloseTo(truePositionMm(dx, dy), 9);
      }),
    );
  });
  it('TP is twice the radial distance and never smaller than 2·|Δx| or 2·|Δy|', () => {
    fc.assert(
      fc.property(dev, dev, (dx, dy) => {
        const tp = truePositionMm(dx, dy);
        expect(tp).toBeGreaterThanOrEqual(2 * Math.max(Math.abs(dx), Math.abs(dy)) - 1e-12);
        expect(tp / 2).toBeCloseTo(Math.sqrt(dx * dx + dy * dy), 12);
      }),
    );
  });
});
