/**
 * A quote for a made-to-order plate, from its geometry and a shop's rates. Every line lists the
 * numbers it was computed from and the arithmetic, so a customer can see why it costs what it
 * costs. Money: integers in minor units; each line is rounded HALF-UP to a whole minor unit on
 * its own (see money.ts), then lines are summed — the total is the sum of the rounded lines.
 *
 * Per plate: material (stock blank mass × price per kg or per lb), machine time per operation
 * (cut length ÷ feed × hourly rate), drilled / tapped / reamed holes and counterbores by count,
 * pocket volume. Per order: parts × quantity, the quantity-break discount on the parts, the setup
 * fee once, then tax on the net.
 */
import { DomainError } from '../errors';
import type { HoleOperation } from '../profileTypes';
import { basisPointsOf, bpToPercent, minorToDecimal, roundHalfUpMinor } from './money';
import { materialKey, type ShopRates } from './settings';

/** Kilograms per avoirdupois pound: 0.45359237 exactly (international yard and pound, 1959). */
export const KG_PER_LB = 0.45359237;

/** Everything about the plate a quote needs (see quoteGeometry for how it is taken from a spec). */
export interface QuoteGeometry {
  materialName: string;
  densityGPerCm3: number;
  plateMassKg: number;
  blank: { widthMm: number; heightMm: number; thicknessMm: number; stockLabel: string | null };
  /** length of cut per operation, mm */
  cutMm: { outline: number; counterbore: number; pocket: number } & Record<HoleOperation, number>;
  counts: { drilledHoles: number; tappedHoles: number; reamedHoles: number; counterbores: number };
  pocketVolumeMm3: number;
}

export type QuoteLineCode =
  | 'material'
  | `machine.${keyof QuoteGeometry['cutMm']}`
  | 'holes.drilled'
  | 'holes.tapped'
  | 'holes.reamed'
  | 'counterbores'
  | 'pocket'
  | 'parts'
  | 'discount'
  | 'setup'
  | 'tax';

export interface QuoteLine {
  code: QuoteLineCode;
  label: string;
  /** 'plate': one plate's cost; 'order': applies to the whole order */
  per: 'plate' | 'order';
  /** the arithmetic in words and numbers, e.g. "1 256.6 mm ÷ 300 mm/min = 4.19 min × 90.00 EUR/h" */
  basis: string;
  inputs: Record<string, number | string>;
  /** exact amount before rounding, minor units (for the record) */
  exactMinor: number;
  /** rounded half-up; negative for the discount */
  amountMinor: number;
}

export interface QuoteTotals {
  perPlateMinor: number;
  quantity: number;
  partsMinor: number;
  discountBp: number;
  discountMinor: number;
  setupMinor: number;
  netMinor: number;
  taxBp: number;
  taxMinor: number;
  totalMinor: number;
}

export interface PlateQuote {
  currency: string;
  currencyMinorDigits: number;
  rounding: 'half-up per line, whole minor units';
  lines: QuoteLine[];
  totals: QuoteTotals;
  machineMinutesPerPlate: number;
  geometry: QuoteGeometry;
}

const OPERATION_LABEL: Record<keyof QuoteGeometry['cutMm'], string> = {
  outline: 'Cut outline',
  through: 'Cut clearance holes',
  tapDrill: 'Drill tap holes',
  dowelReam: 'Drill and ream dowel holes',
  centreBore: 'Cut centre bore',
  starterBore: 'Cut starter bore',
  counterbore: 'Cut counterbores',
  pocket: 'Cut pocket walls',
};
const OPERATIONS = Object.keys(OPERATION_LABEL) as (keyof QuoteGeometry['cutMm'])[];

const num = (x: number, digits = 2) => Number(x.toFixed(digits)).toString();

/** The quantity break that applies: the one with the largest minQuantity not above quantity. */
export function quantityBreakFor(rates: ShopRates, quantity: number): { minQuantity: number; discountBp: number } {
  let best = { minQuantity: 1, discountBp: 0 };
  for (const b of rates.quantityBreaks) if (b.minQuantity <= quantity && b.minQuantity >= best.minQuantity) best = b;
  return best;
}

export function quotePlate(geometry: QuoteGeometry, rates: ShopRates, quantity: number): PlateQuote {
  if (!Number.isInteger(quantity) || quantity < 1) throw new DomainError('quote.quantity', `quantity must be a whole number of plates, 1 or more; got ${quantity}`, ['quantity']);
  if (quantity > rates.maxQuantity) throw new DomainError('quote.quantity', `this shop quotes up to ${rates.maxQuantity} plates at a time; ask for ${rates.maxQuantity} or fewer`, ['quantity']);
  const cur = rates.currency;
  const d = rates.currencyMinorDigits;
  const money = (minor: number) => `${minorToDecimal(minor, d)} ${cur}`;
  const lines: QuoteLine[] = [];
  const push = (line: Omit<QuoteLine, 'amountMinor'> & { amountMinor?: number }) => {
    const amountMinor = line.amountMinor ?? roundHalfUpMinor(line.exactMinor);
    lines.push({ ...line, amountMinor });
  };

  // material: the blank that is bought and sawn, not the finished plate
  const price = rates.materials.find((m) => materialKey(m.material) === materialKey(geometry.materialName));
  if (!price) {
    throw new DomainError('quote.no_material_price', `${rates.shopName} has no price for the material "${geometry.materialName}"; an admin adds it in Shop settings (priced now: ${rates.materials.map((m) => m.material).join(', ')})`, ['material']);
  }
  const { widthMm, heightMm, thicknessMm, stockLabel } = geometry.blank;
  const blankCm3 = (widthMm * heightMm * thicknessMm) / 1000;
  const blankKg = (blankCm3 * geometry.densityGPerCm3) / 1000;
  const qty = price.unit === 'kg' ? blankKg : blankKg / KG_PER_LB;
  push({
    code: 'material',
    label: `Material: ${price.material} blank${stockLabel ? ` from ${stockLabel} plate` : ''}`,
    per: 'plate',
    basis: `${num(widthMm, 1)} × ${num(heightMm, 1)} × ${num(thicknessMm, 2)} mm = ${num(blankCm3, 1)} cm³ × ${geometry.densityGPerCm3} g/cm³ = ${num(blankKg, 3)} kg${price.unit === 'lb' ? ` = ${num(qty, 3)} lb` : ''} × ${money(price.pricePerUnitMinor)}/${price.unit}`,
    inputs: { widthMm, heightMm, thicknessMm, densityGPerCm3: geometry.densityGPerCm3, blankMassKg: blankKg, quantity: qty, unit: price.unit, pricePerUnitMinor: price.pricePerUnitMinor },
    exactMinor: qty * price.pricePerUnitMinor,
  });

  // machine time, per operation
  let minutes = 0;
  for (const op of OPERATIONS) {
    const mm = geometry.cutMm[op];
    if (!(mm > 0)) continue;
    const feedMmPerMin = rates.feedsMmPerMin[op];
    const min = mm / feedMmPerMin;
    minutes += min;
    push({
      code: `machine.${op}`,
      label: OPERATION_LABEL[op],
      per: 'plate',
      basis: `${num(mm, 1)} mm ÷ ${feedMmPerMin} mm/min = ${num(min)} min × ${money(rates.machineRateMinorPerHour)}/h`,
      inputs: { cutLengthMm: mm, feedMmPerMin, minutes: min, machineRateMinorPerHour: rates.machineRateMinorPerHour },
      exactMinor: (min / 60) * rates.machineRateMinorPerHour,
    });
  }

  // features by count
  const counted: [QuoteLineCode, string, number, number][] = [
    ['holes.drilled', 'Drilled clearance holes', geometry.counts.drilledHoles, rates.perFeatureMinor.drilledHole],
    ['holes.tapped', 'Tapped holes (drill and tap)', geometry.counts.tappedHoles, rates.perFeatureMinor.tappedHole],
    ['holes.reamed', 'Reamed dowel holes', geometry.counts.reamedHoles, rates.perFeatureMinor.reamedHole],
    ['counterbores', 'Counterbores', geometry.counts.counterbores, rates.perFeatureMinor.counterbore],
  ];
  for (const [code, label, count, each] of counted) {
    if (count === 0) continue;
    push({ code, label, per: 'plate', basis: `${count} × ${money(each)}`, inputs: { count, eachMinor: each }, exactMinor: count * each });
  }
  if (geometry.pocketVolumeMm3 > 0) {
    const cm3 = geometry.pocketVolumeMm3 / 1000;
    push({
      code: 'pocket',
      label: 'Pocket material removal',
      per: 'plate',
      basis: `${num(cm3, 2)} cm³ × ${money(rates.pocketMinorPerCm3)}/cm³`,
      inputs: { pocketVolumeCm3: cm3, pocketMinorPerCm3: rates.pocketMinorPerCm3 },
      exactMinor: cm3 * rates.pocketMinorPerCm3,
    });
  }

  const perPlateMinor = lines.reduce((s, l) => s + l.amountMinor, 0);
  const partsMinor = perPlateMinor * quantity;
  push({ code: 'parts', label: `Plates × ${quantity}`, per: 'order', basis: `${money(perPlateMinor)} per plate × ${quantity}`, inputs: { perPlateMinor, quantity }, exactMinor: partsMinor, amountMinor: partsMinor });
  const brk = quantityBreakFor(rates, quantity);
  const discountMinor = basisPointsOf(partsMinor, brk.discountBp);
  if (brk.discountBp > 0) {
    push({
      code: 'discount',
      label: `Quantity break (${brk.minQuantity} or more)`,
      per: 'order',
      basis: `${bpToPercent(brk.discountBp)} of ${money(partsMinor)}`,
      inputs: { discountBp: brk.discountBp, partsMinor, minQuantity: brk.minQuantity },
      exactMinor: -(partsMinor * brk.discountBp) / 10_000,
      amountMinor: -discountMinor,
    });
  }
  const setupMinor = rates.setupFeeMinor;
  if (setupMinor > 0) push({ code: 'setup', label: 'Setup (fixturing, program, first-part check)', per: 'order', basis: 'once per order', inputs: { setupFeeMinor: setupMinor }, exactMinor: setupMinor, amountMinor: setupMinor });
  const netMinor = partsMinor - discountMinor + setupMinor;
  const taxMinor = basisPointsOf(netMinor, rates.taxRateBp);
  push({
    code: 'tax',
    label: `${rates.taxLabel} ${bpToPercent(rates.taxRateBp)}`,
    per: 'order',
    basis: `${bpToPercent(rates.taxRateBp)} of ${money(netMinor)}`,
    inputs: { taxRateBp: rates.taxRateBp, netMinor },
    exactMinor: (netMinor * rates.taxRateBp) / 10_000,
    amountMinor: taxMinor,
  });

  return {
    currency: cur,
    currencyMinorDigits: d,
    rounding: 'half-up per line, whole minor units',
    lines,
    totals: { perPlateMinor, quantity, partsMinor, discountBp: brk.discountBp, discountMinor, setupMinor, netMinor, taxBp: rates.taxRateBp, taxMinor, totalMinor: netMinor + taxMinor },
    machineMinutesPerPlate: minutes,
    geometry,
  };
}
