/** What a quote needs from a plate spec: blank, mass, cut lengths per operation, feature counts, pocket volume. */
import { cutLength, plateMass, stockSize } from '../mass';
import { plateProfile } from '../profile';
import type { PlateSpec } from '../spec';
import type { QuoteGeometry } from './quote';

export function quoteGeometry(spec: PlateSpec, sawAllowanceMm: number): QuoteGeometry {
  const stock = stockSize(spec, { sawAllowanceMm });
  const mass = plateMass(spec);
  const cut = cutLength(spec);
  const profile = plateProfile(spec);
  const counts = { drilledHoles: 0, tappedHoles: 0, reamedHoles: 0, counterbores: 0 };
  for (const h of profile.holes) {
    if (h.operation === 'through') counts.drilledHoles++;
    else if (h.operation === 'tapDrill') counts.tappedHoles++;
    else if (h.operation === 'dowelReam') counts.reamedHoles++;
    if (h.counterbore) counts.counterbores++;
  }
  return {
    materialName: spec.material.name,
    densityGPerCm3: spec.material.densityGPerCm3,
    plateMassKg: mass.massKg,
    // no stock size thick enough: the blank is priced at the plate thickness itself
    blank: { widthMm: stock.widthMm, heightMm: stock.heightMm, thicknessMm: stock.stock?.thicknessMm ?? spec.thicknessMm, stockLabel: stock.stock?.label ?? null },
    cutMm: { outline: cut.outlineMm, ...cut.holesMm, counterbore: cut.counterboresMm, pocket: cut.pocketsMm },
    counts,
    pocketVolumeMm3: mass.breakdown.pocketsMm3,
  };
}
