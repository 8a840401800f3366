/**
 * Ring gear / starter pinion centre distance for a standard (unshifted) external pair:
 * a = m·(z1 + z2)/2 with module m in mm, or a = (N1 + N2)/(2·P) in inch with diametral pitch P
 * (teeth per inch of pitch diameter), returned in mm. ISO 21771 / AGMA basics.
 */
import { DomainError } from '../errors';
import { MM_PER_IN } from '../units';

export type GearPairInput =
  | { readonly ringTeeth: number; readonly pinionTeeth: number; readonly moduleMm: number }
  | { readonly ringTeeth: number; readonly pinionTeeth: number; readonly diametralPitch: number };

function teeth(value: unknown, field: string): number {
  if (typeof value !== 'number' || !Number.isInteger(value) || value < 1) {
    throw new DomainError('gear.invalid', `${field} must be a whole number of teeth (at least 1), got ${String(value)}.`, [field]);
  }
  return value;
}

function positive(value: unknown, field: string): number {
  if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0) {
    throw new DomainError('gear.invalid', `${field} must be a positive number, got ${String(value)}.`, [field]);
  }
  return value;
}

/** Module of the pair in mm (for diametral pitch P: m = 25.4 / P). */
export function gearModuleMm(input: GearPairInput): number {
  const hasModule = 'moduleMm' in input && input.moduleMm !== undefined;
  const hasDp = 'diametralPitch' in input && (input as { diametralPitch?: number }).diametralPitch !== undefined;
  if (hasModule === hasDp) {
    throw new DomainError('gear.invalid', 'Give either moduleMm (metric) or diametralPitch (inch), not both or neither.', [
      hasModule ? 'diametralPitch' : 'moduleMm',
    ]);
  }
  return hasModule
    ? positive((input as { moduleMm: number }).moduleMm, 'moduleMm')
    : MM_PER_IN / positive((input as { diametralPitch: number }).diametralPitch, 'diametralPitch');
}

/** Pitch diameter of one gear, mm: d = m·z. */
export function pitchDiameterMm(teethCount: number, moduleMm: number): number {
  return teeth(teethCount, 'teeth') * positive(moduleMm, 'moduleMm');
}

/** Centre distance of the ring gear and the starter pinion, mm. */
export function gearCenterDistanceMm(input: GearPairInput): number {
  const z1 = teeth(input.ringTeeth, 'ringTeeth');
  const z2 = teeth(input.pinionTeeth, 'pinionTeeth');
  if ('diametralPitch' in input && !('moduleMm' in input && input.moduleMm !== undefined)) {
    // a = (N1 + N2) / (2 P) inch
    const p = positive(input.diametralPitch, 'diametralPitch');
    return ((z1 + z2) / (2 * p)) * MM_PER_IN;
  }
  const m = gearModuleMm(input);
  return (m * (z1 + z2)) / 2;
}
