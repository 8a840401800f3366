import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { parsePlateSpec, plateProfile } from '../../../src/domain/index';
import {
  basisPointsOf,
  DEFAULT_SHOP_RATES,
  formatMoney,
  KG_PER_LB,
  minorToDecimal,
  quantityBreakFor,
  quoteGeometry,
  quotePlate,
  roundHalfUpMinor,
  shopRatesSchema,
  type ShopRates,
} from '../../../src/domain/quote/index';

// A plain rectangle 200 × 100 mm, 12 mm thick, with a Ø50 centre bore and nothing else: every
// number below can be followed with a pencil.
const rectangle = parsePlateSpec({
  schemaVersion: 1,
  engineFace: { viewedFrom: 'rear', holes: [] },
  transmissionFace: { viewedFrom: 'front', holes: [] },
  centreBore: { kind: 'bore', diameterMm: 50 },
  thicknessMm: 12,
  thicknessStock: 'metric',
  outline: { kind: 'polygon', points: [{ x: -100, y: -50 }, { x: 100, y: -50 }, { x: 100, y: 50 }, { x: -100, y: 50 }] },
});

// Rates of the test's own (invented), so the arithmetic does not move when the demo defaults do.
const rates: ShopRates = shopRatesSchema.parse({
  ...DEFAULT_SHOP_RATES,
  materials: [{ material: '6061-T6', pricePerUnitMinor: 950, unit: 'kg' }],
  sawAllowanceMm: 5,
  machineRateMinorPerHour: 9000,
  feedsMmPerMin: { outline: 600, through: 300, tapDrill: 300, dowelReam: 150, centreBore: 400, starterBore: 300, counterbore: 200, pocket: 250 },
  setupFeeMinor: 6500,
  taxRateBp: 1900,
  quantityBreaks: [{ minQuantity: 1, discountBp: 0 }, { minQuantity: 3, discountBp: 500 }],
});

describe('quote geometry from the spec', () => {
  it('takes the blank, mass and cut lengths of a hand-checkable plate', () => {
    const g = quoteGeometry(rectangle, 5);
    // blank = bounding box 200 × 100 plus 5 mm saw allowance on every side = 210 × 110 mm, 12 mm stock
    expect(g.blank.widthMm).toBeCloseTo(210, 9);
    expect(g.blank.heightMm).toBeCloseTo(110, 9);
    expect(g.blank.thicknessMm).toBeCloseTo(12, 9);
    expect(g.blank.stockLabel).toBe('12 mm');
    // 6061 density 2.70 g/cm³ (Aluminum Association typical value, REFERENCES.md):
    // plate volume (200·100 − π·25²)·12 = 216 438.06 mm³ → × 2.70e-6 kg/mm³ = 0.584383 kg
    expect(g.densityGPerCm3).toBe(2.7);
    expect(g.plateMassKg).toBeCloseTo(0.584383, 5);
    // outline perimeter 2·(200+100) = 600 mm; centre bore circumference π·50 = 157.0796 mm
    expect(g.cutMm.outline).toBeCloseTo(600, 6);
    expect(g.cutMm.centreBore).toBeCloseTo(157.0796, 3);
    expect(g.counts).toEqual({ drilledHoles: 0, tappedHoles: 0, reamedHoles: 0, counterbores: 0 });
    expect(g.pocketVolumeMm3).toBe(0);
  });

  it('counts the demo plate’s features by operation, as its profile lists them', () => {
    const demo = parsePlateSpec(JSON.parse(readFileSync(new URL('../../../templates/plates/demo.json', import.meta.url), 'utf8')));
    const g = quoteGeometry(demo, 5);
    const holes = plateProfile(demo).holes;
    expect(g.counts.drilledHoles).toBe(holes.filter((h) => h.operation === 'through').length);
    expect(g.counts.reamedHoles).toBe(holes.filter((h) => h.operation === 'dowelReam').length);
    expect(g.counts.counterbores).toBe(holes.filter((h) => h.counterbore).length);
    // the demo file: 8 engine + 7 transmission clearance holes at least, 4 dowels (2 per face), 8 counterbores (E1–E8)
    expect(g.counts.drilledHoles).toBeGreaterThanOrEqual(15);
    expect(g.counts.reamedHoles).toBe(4);
    expect(g.counts.counterbores).toBe(8);
  });
});

describe('quote arithmetic, by hand', () => {
  const q = quotePlate(quoteGeometry(rectangle, 5), rates, 3);
  const line = (code: string) => q.lines.find((l) => l.code === code)!;

  it('prices material on the blank: 210 × 110 × 12 mm × 2.70 g/cm³ × 9.50 EUR/kg', () => {
    // 277.2 cm³ × 2.70 g/cm³ = 748.44 g = 0.74844 kg; × 950 c/kg = 711.018 c → half-up 711 c
    expect(line('material').inputs.blankMassKg as number).toBeCloseTo(0.74844, 9);
    expect(line('material').exactMinor).toBeCloseTo(711.018, 6);
    expect(line('material').amountMinor).toBe(711);
    expect(line('material').basis).toContain('2.7 g/cm³');
  });

  it('prices machine time per operation from cut length and feed', () => {
    // outline 600 mm ÷ 600 mm/min = 1 min; 1/60 h × 9000 c/h = 150 c
    expect(line('machine.outline').amountMinor).toBe(150);
    // centre bore 157.0796 mm ÷ 400 mm/min = 0.3927 min; /60 × 9000 = 58.905 c → 59 c
    expect(line('machine.centreBore').exactMinor).toBeCloseTo(58.905, 3);
    expect(line('machine.centreBore').amountMinor).toBe(59);
    expect(q.lines.some((l) => l.code === 'machine.through')).toBe(false); // no holes, no line
  });

  it('adds lines up: parts, 5 % break at 3, setup once, 19 % tax', () => {
    // per plate 711 + 150 + 59 = 920 c; × 3 = 2760 c
    expect(q.totals.perPlateMinor).toBe(920);
    expect(q.totals.partsMinor).toBe(2760);
    // 5 % of 2760 = 138.0 c
    expect(q.totals.discountMinor).toBe(138);
    expect(line('discount').amountMinor).toBe(-138);
    // net 2760 − 138 + 6500 = 9122 c; tax 19 % = 1733.18 → 1733 c; total 10 855 c
    expect(q.totals.netMinor).toBe(9122);
    expect(q.totals.taxMinor).toBe(1733);
    expect(q.totals.totalMinor).toBe(10855);
    // the total is the sum of the order lines as listed
    expect(q.lines.filter((l) => l.per === 'order').reduce((s, l) => s + l.amountMinor, 0)).toBe(10855);
    for (const l of q.lines) expect(Number.isInteger(l.amountMinor), l.code).toBe(true);
  });

  it('prices per pound when the shop does: 0.74844 kg ÷ 0.45359237 kg/lb × 4.31 per lb', () => {
    // 1 lb = 0.45359237 kg exactly (international yard and pound agreement, 1959)
    expect(KG_PER_LB).toBe(0.45359237);
    const perLb = { ...rates, materials: [{ material: '6061-T6', pricePerUnitMinor: 431, unit: 'lb' as const }] };
    const m = quotePlate(quoteGeometry(rectangle, 5), perLb, 1).lines.find((l) => l.code === 'material')!;
    // 0.74844 / 0.45359237 = 1.650028 lb; × 431 = 711.162 c → 711 c
    expect(m.inputs.quantity as number).toBeCloseTo(1.650028, 5);
    expect(m.amountMinor).toBe(711);
    expect(m.basis).toMatch(/lb/);
  });

  it('no break below 3 plates, and no setup or discount lines that are zero', () => {
    const one = quotePlate(quoteGeometry(rectangle, 5), { ...rates, setupFeeMinor: 0 }, 2);
    expect(one.totals.discountMinor).toBe(0);
    expect(one.lines.some((l) => l.code === 'discount' || l.code === 'setup')).toBe(false);
    // 920 × 2 = 1840; tax 19 % = 349.6 → 350; total 2190
    expect(one.totals.totalMinor).toBe(2190);
  });

  it('refuses a material the shop does not price, and quantities out of range, with a message', () => {
    const steel = parsePlateSpec({ ...rectangle, material: { name: 'S355', densityGPerCm3: 7.85, kind: 'steel' } });
    expect(() => quotePlate(quoteGeometry(steel, 5), rates, 1)).toThrow(/no price for the material "S355"/);
    expect(() => quotePlate(quoteGeometry(rectangle, 5), rates, 0)).toThrow(/1 or more/);
    expect(() => quotePlate(quoteGeometry(rectangle, 5), rates, rates.maxQuantity + 1)).toThrow(/up to/);
    expect(() => quotePlate(quoteGeometry(rectangle, 5), rates, 1.5)).toThrow(/whole number/);
  });
});

describe('money rounding', () => {
  it('rounds half-up to whole minor units, not to even', () => {
    expect(roundHalfUpMinor(0.5)).toBe(1);
    expect(roundHalfUpMinor(2.5)).toBe(3); // round-half-even would give 2
    expect(roundHalfUpMinor(0.49)).toBe(0);
    // 1.005 EUR in cents is 100.49999999999999 in binary floating point; it is an exact half
    expect(1.005 * 100).toBeLessThan(100.5);
    expect(roundHalfUpMinor(1.005 * 100)).toBe(101);
    expect(() => roundHalfUpMinor(-1)).toThrow(/0 or more/);
    expect(() => roundHalfUpMinor(Number.NaN)).toThrow();
  });

  it('takes basis points in integer arithmetic, half-up', () => {
    expect(basisPointsOf(25, 1000)).toBe(3); // 2.5 → 3
    expect(basisPointsOf(5, 1000)).toBe(1); // 0.5 → 1
    expect(basisPointsOf(4, 1000)).toBe(0); // 0.4 → 0
    expect(basisPointsOf(9122, 1900)).toBe(1733); // 1733.18
    expect(basisPointsOf(150, 1900)).toBe(29); // 28.5 → 29
  });

  it('writes minor units as decimals and money', () => {
    expect(minorToDecimal(10855, 2)).toBe('108.55');
    expect(minorToDecimal(5, 2)).toBe('0.05');
    expect(minorToDecimal(-138, 2)).toBe('-1.38');
    expect(minorToDecimal(1200, 0)).toBe('1200');
    expect(formatMoney(10855, 'EUR', 2)).toBe('€108.55');
    expect(formatMoney(123456, 'USD', 2)).toBe('US$1,234.56');
  });

  it('picks the largest quantity break not above the quantity', () => {
    const r = { ...rates, quantityBreaks: [{ minQuantity: 10, discountBp: 1200 }, { minQuantity: 1, discountBp: 0 }, { minQuantity: 3, discountBp: 500 }] };
    expect(quantityBreakFor(r, 2).discountBp).toBe(0);
    expect(quantityBreakFor(r, 3).discountBp).toBe(500);
    expect(quantityBreakFor(r, 9).discountBp).toBe(500);
    expect(quantityBreakFor(r, 10).discountBp).toBe(1200);
  });

  it('rejects shop rates that cannot be right', () => {
    const bad = shopRatesSchema.safeParse({ ...rates, currency: 'euro', taxRateBp: 19.5, materials: [] });
    expect(bad.success).toBe(false);
    const paths = bad.error!.issues.map((i) => i.path.join('.'));
    expect(paths).toEqual(expect.arrayContaining(['currency', 'taxRateBp', 'materials']));
  });
});

describe('amounts typed by an admin', () => {
  it('reads decimals into minor units exactly, and refuses what is not an amount', async () => {
    const { decimalToMinor } = await import('../../../src/domain/quote/money');
    expect(decimalToMinor('9.50', 2)).toBe(950);
    expect(decimalToMinor('9,5', 2)).toBe(950);
    expect(decimalToMinor('12', 2)).toBe(1200);
    expect(decimalToMinor('0.07', 2)).toBe(7);
    expect(decimalToMinor('1.005', 2)).toBeNull(); // more decimals than the currency has
    expect(decimalToMinor('-3', 2)).toBeNull();
    expect(decimalToMinor('abc', 2)).toBeNull();
    expect(decimalToMinor('1200', 0)).toBe(1200);
  });
});
