import { describe, expect, it } from 'vitest';
import { DomainError } from '~/domain/errors';
import { capScrewHead } from '~/domain/standards/capScrews';

describe('ISO 4762 socket head cap screws', () => {
  // REFERENCES.md "Fasteners": dk M6 10 … M16 24 mm [S]; k = d [M, from memory; also the ISO 4762 / DIN 912
  // tables reprinted by fastener suppliers]; DIN 974-1 counterbores 11, 15, 18, 20, 24, 26 mm [M, from memory]
  const table: [string, number, number, number][] = [
    ['M6', 10, 6, 11],
    ['M8', 13, 8, 15],
    ['M10', 16, 10, 18],
    ['M12', 18, 12, 20],
    ['M14', 21, 14, 24],
    ['M16', 24, 16, 26],
  ];
  it.each(table)('%s: dk %d, k %d, counterbore Ø%d mm', (size, dk, k, cb) => {
    const h = capScrewHead(size);
    expect(h.headDiameterMm).toBe(dk);
    expect(h.headHeightMm).toBe(k);
    expect(h.counterboreDiameterMm).toBe(cb);
    // counterbore depth = k + 0.5 mm so the head sits below the face (common practice)
    expect(h.counterboreDepthMm).toBeCloseTo(k + 0.5, 12);
    expect(h.counterboreDiameterMm).toBeGreaterThan(h.headDiameterMm);
  });
});

describe('ASME B18.3 inch socket head cap screws', () => {
  // ASME B18.3 head diameter A max / head height H max, inch (from memory; matches the B18.3 tables
  // reprinted by fastener suppliers); counterbore Ø from common shop charts (from memory)
  const table: [string, number, number, number][] = [
    ['1/4', 0.375, 0.25, 7 / 16],
    ['5/16', 0.469, 0.312, 17 / 32],
    ['3/8', 0.562, 0.375, 5 / 8],
    ['7/16', 0.656, 0.438, 23 / 32],
    ['1/2', 0.75, 0.5, 13 / 16],
    ['5/8', 0.938, 0.625, 1],
  ];
  it.each(table)('%s: A %d in, H %d in', (size, a, hh, cb) => {
    const h = capScrewHead(`${size}-${size === '1/4' ? 20 : size === '5/16' ? 18 : size === '3/8' ? 16 : size === '7/16' ? 14 : size === '1/2' ? 13 : 11} UNC`);
    expect(h.headDiameterMm).toBeCloseTo(a * 25.4, 9);
    expect(h.headHeightMm).toBeCloseTo(hh * 25.4, 9);
    expect(h.counterboreDiameterMm).toBeCloseTo(cb * 25.4, 9);
    expect(h.counterboreDiameterMm).toBeGreaterThan(h.headDiameterMm);
    expect(h.standard).toBe('ASME B18.3');
  });
});

describe('bad input', () => {
  it('refuses sizes outside the table', () => {
    expect(() => capScrewHead('M5')).toThrow(DomainError);
    expect(() => capScrewHead('M5')).toThrow(/M6, M8/);
    expect(() => capScrewHead('#10')).toThrow(/capScrew|socket head/i);
  });
});
