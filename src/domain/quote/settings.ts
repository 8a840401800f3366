/**
 * A shop's quoting rates: what it charges for material, machine time, holes, pockets and setup,
 * its quantity breaks, currency and tax. Admin-editable; every money value is an integer in the
 * currency's minor units (cents for EUR/USD), every rate of tax or discount in basis points
 * (1 bp = 0.01 %, so 1900 bp = 19 %).
 */
import { z } from 'zod';

const minor = (what: string) => z.int({ error: `${what} must be a whole number of minor units (e.g. cents)` }).min(0, { error: `${what} must be 0 or more` }).max(100_000_000_00);
const feed = z.number({ error: 'must be a feed in mm/min' }).positive({ error: 'must be greater than 0 mm/min' }).max(100_000);

export const MATERIAL_PRICE_UNITS = ['kg', 'lb'] as const;
export type MaterialPriceUnit = (typeof MATERIAL_PRICE_UNITS)[number];

export const materialPriceSchema = z
  .object({
    /** matches the plate spec's material name (case and spaces ignored), e.g. "6061-T6" */
    material: z.string().trim().min(1, { error: 'name the material' }).max(60),
    pricePerUnitMinor: minor('pricePerUnitMinor').refine((v) => v > 0, { error: 'pricePerUnitMinor must be greater than 0' }),
    unit: z.enum(MATERIAL_PRICE_UNITS, { error: 'unit must be "kg" or "lb"' }),
  })
  .strict();

export const quantityBreakSchema = z
  .object({
    minQuantity: z.int({ error: 'minQuantity must be a whole number' }).min(1).max(10_000),
    /** discount on the parts (not on setup), basis points: 1000 = 10 % */
    discountBp: z.int({ error: 'discountBp must be whole basis points' }).min(0).max(9000, { error: 'a discount above 90 % is not a quantity break' }),
  })
  .strict();

export const shopRatesSchema = z
  .object({
    shopName: z.string().trim().min(1).max(120),
    /** ISO 4217 code, e.g. "EUR" */
    currency: z.string().regex(/^[A-Z]{3}$/, { error: 'currency must be a three-letter ISO 4217 code such as EUR or USD' }),
    /** digits after the decimal point of the currency: 2 for EUR/USD, 0 for JPY */
    currencyMinorDigits: z.int().min(0).max(3),
    taxLabel: z.string().trim().min(1).max(40),
    /** 1900 = 19 % */
    taxRateBp: z.int({ error: 'taxRateBp must be whole basis points' }).min(0).max(5000, { error: 'taxRateBp above 5000 (50 %) is not a tax rate' }),
    quoteValidDays: z.int({ error: 'quoteValidDays must be a whole number of days' }).min(1).max(365),
    materials: z.array(materialPriceSchema).min(1, { error: 'price at least one material' }).max(50),
    /** added on every side of the bounding box to get the blank */
    sawAllowanceMm: z.number().min(0).max(100),
    machineRateMinorPerHour: minor('machineRateMinorPerHour'),
    feedsMmPerMin: z
      .object({
        outline: feed,
        through: feed,
        tapDrill: feed,
        dowelReam: feed,
        centreBore: feed,
        starterBore: feed,
        counterbore: feed,
        pocket: feed,
      })
      .strict(),
    perFeatureMinor: z
      .object({
        /** drilling a clearance hole */
        drilledHole: minor('drilledHole'),
        /** drilling and tapping a tapped hole */
        tappedHole: minor('tappedHole'),
        /** reaming a dowel hole to its fit */
        reamedHole: minor('reamedHole'),
        counterbore: minor('counterbore'),
      })
      .strict(),
    pocketMinorPerCm3: minor('pocketMinorPerCm3'),
    setupFeeMinor: minor('setupFeeMinor'),
    quantityBreaks: z.array(quantityBreakSchema).max(20),
    maxQuantity: z.int().min(1).max(10_000),
  })
  .strict()
  .superRefine((s, ctx) => {
    const seen = new Set<number>();
    s.quantityBreaks.forEach((b, i) => {
      if (seen.has(b.minQuantity)) ctx.addIssue({ code: 'custom', message: `two quantity breaks start at ${b.minQuantity}`, path: ['quantityBreaks', i, 'minQuantity'] });
      seen.add(b.minQuantity);
    });
    const names = new Set<string>();
    s.materials.forEach((m, i) => {
      const k = materialKey(m.material);
      if (names.has(k)) ctx.addIssue({ code: 'custom', message: `material "${m.material}" is priced twice`, path: ['materials', i, 'material'] });
      names.add(k);
    });
  });

export type ShopRates = z.infer<typeof shopRatesSchema>;

/** How a material name is matched: case and spaces ignored. */
export function materialKey(name: string): string {
  return name.toLowerCase().replace(/\s+/g, '');
}

/**
 * Invented starting rates for a small shop (demo data, not market prices): admins change them in
 * Shop settings.
 */
export const DEFAULT_SHOP_RATES: ShopRates = Object.freeze({
  shopName: 'Ridgeway Fabrication (demo shop)',
  currency: 'EUR',
  currencyMinorDigits: 2,
  taxLabel: 'VAT',
  taxRateBp: 1900,
  quoteValidDays: 30,
  materials: [
    { material: '6061-T6', pricePerUnitMinor: 950, unit: 'kg' as const },
    { material: '6061-T651', pricePerUnitMinor: 980, unit: 'kg' as const },
    { material: '7075-T6', pricePerUnitMinor: 2400, unit: 'kg' as const },
  ],
  sawAllowanceMm: 5,
  machineRateMinorPerHour: 9000,
  feedsMmPerMin: { outline: 600, through: 300, tapDrill: 300, dowelReam: 150, centreBore: 400, starterBore: 300, counterbore: 200, pocket: 250 },
  perFeatureMinor: { drilledHole: 80, tappedHole: 250, reamedHole: 400, counterbore: 300 },
  pocketMinorPerCm3: 15,
  setupFeeMinor: 6500,
  quantityBreaks: [
    { minQuantity: 1, discountBp: 0 },
    { minQuantity: 3, discountBp: 500 },
    { minQuantity: 10, discountBp: 1200 },
  ],
  maxQuantity: 50,
}) as ShopRates;
