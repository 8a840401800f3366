import { describe, expect, it } from 'vitest';
import * as domain from '../../../src/domain/index';

describe('the public entry point of the domain', () => {
  const required = [
    'plateSpecSchema',
    'parsePlateSpec',
    'parseLength',
    'formatLength',
    'clearanceHoleMm',
    'tapDrillMm',
    'isoFit',
    'flywheelHousing',
    'boltCircle',
    'fitCircle',
    'fitPlane',
    'fitBoltCircle',
    'gearCenterDistanceMm',
    'stackUp',
    'plateProfile',
    'checkPlate',
    'plateMass',
    'stockSize',
    'cutLength',
    'DomainError',
    'layoutIsDisjoint',
  ] as const;

  it('exports every agreed name', () => {
    const missing = required.filter((name) => !(name in domain));
    expect(missing).toEqual([]);
  });

  it('the re-exports are the real functions', () => {
    // ISO 273 medium (H13): M10 → 11.0 mm
    expect(domain.clearanceHoleMm('M10', 'medium')).toBe(11.0);
    // metric coarse tap drill: M10x1.5 → 8.5 mm
    expect(domain.tapDrillMm('M10x1.5')).toBe(8.5);
    // a = m(z1 + z2)/2 = 2.5 × 110 / 2 (ISO 21771)
    expect(domain.gearCenterDistanceMm({ ringTeeth: 100, pinionTeeth: 10, moduleMm: 2.5 })).toBeCloseTo(137.5, 12);
    expect(domain.parseLength('1/2 in', 'mm')).toBeCloseTo(12.7, 12);
    expect(() => domain.parsePlateSpec({})).toThrowError(domain.DomainError);
  });
});
