/**
 * Check findings in the display unit. `checkPlate` words its messages in millimetres (every length
 * written as `12.34 mm`, see `formatLength`); in inch mode the editor shows each of those figures
 * in inch first with the millimetres kept beside it in brackets, as dual-dimensioned drawings do:
 * `0.486 in [12.34 mm]`. Areas (mm²), rates (mm/m) and text without figures are left alone.
 */
import { MM_PER_IN } from '../units';
import type { DisplayUnits } from './units';

/** a signed decimal figure followed by " mm" as a whole word (not mm², mm/…, mmol …) */
const MM_FIGURE = /(^|[^\d.])(-?\d+(?:\.\d+)?) mm(?![\w²³/])/g;

/** Inch decimals for a figure given with `mmDecimals` decimals: one more than the mm figure, at least 3. */
function inchDecimals(mmDecimals: number): number {
  return Math.max(3, mmDecimals + 1);
}

/** The text with every millimetre figure also (first) in inch when the display unit is inch. */
export function lengthsInUnits(text: string, units: Pick<DisplayUnits, 'length'>): string {
  if (units.length !== 'in') return text;
  return text.replace(MM_FIGURE, (_all, lead: string, figure: string) => {
    const mm = Number(figure);
    const decimals = inchDecimals(figure.split('.')[1]?.length ?? 0);
    const inch = (mm / MM_PER_IN).toFixed(decimals);
    return `${lead}${Number(inch) === 0 ? (0).toFixed(decimals) : inch} in [${figure} mm]`;
  });
}
