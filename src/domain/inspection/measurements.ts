/**
 * Measured values as the shop enters them: one row per feature id. Holes take x, y (centre in
 * plate coordinates), diameter and depth; thickness points THK1… take z = the measured
 * thickness (x, y where it was taken, optional); flatness points FP1… take x, y, z on one face;
 * FLAT takes z = a flatness reading (e.g. feeler gauge on a surface plate). All in mm.
 */
import { z } from 'zod/mini';
import { FLATNESS_ID, FLATNESS_POINT_ID_RE, THICKNESS_ID_RE, isKnownFeatureId, type InspectionPlan } from './plan';

// zod/mini (functions a bundler can leave out) with zod's English messages where none is given
if (!z.core.globalConfig.localeError) z.config(z.locales.en());

// z.number() takes finite numbers only: Infinity and NaN are "not a number" here too
const mm = z.number({ error: 'must be a number (mm)' }).check(z.minimum(-10_000), z.maximum(10_000));

export const measurementRowSchema = z.strictObject({
  featureId: z
    .string({ error: 'is required (a feature id as in the hole table)' })
    .check(z.trim(), z.minLength(1, 'is required (a feature id as in the hole table)'), z.maxLength(40)),
  x: z.optional(mm),
  y: z.optional(mm),
  z: z.optional(mm),
  diameter: z.optional(mm.check(z.positive({ error: 'must be greater than 0 mm' }))),
  depth: z.optional(mm.check(z.minimum(0, { error: 'must be 0 mm or more' }))),
});

export type MeasurementRow = z.infer<typeof measurementRowSchema>;

export interface RowError {
  /** index in the rows array (JSON) or the line number (CSV), 1-based for CSV */
  readonly row: number;
  readonly featureId?: string;
  readonly column?: string;
  readonly message: string;
}

/** Row-level problems of a measurement set against a plan: unknown ids, duplicates, missing values. */
export function rowProblems(plan: InspectionPlan, rows: readonly MeasurementRow[], rowNumber: (i: number) => number = (i) => i): RowError[] {
  const errors: RowError[] = [];
  const seen = new Map<string, number>();
  rows.forEach((r, i) => {
    const row = rowNumber(i);
    const id = r.featureId;
    if (!isKnownFeatureId(plan, id)) {
      errors.push({ row, featureId: id, column: 'featureId', message: `unknown feature id "${id}": use the ids of the hole table (e.g. ${plan.holes.slice(0, 3).map((h) => h.id).join(', ')}), THK1… for thickness, FP1… for flatness points or FLAT` });
      return;
    }
    const first = seen.get(id);
    if (first !== undefined) {
      errors.push({ row, featureId: id, column: 'featureId', message: `${id} is already given in row ${first}` });
      return;
    }
    seen.set(id, row);
    const has = (k: keyof MeasurementRow) => r[k] !== undefined;
    if (THICKNESS_ID_RE.test(id) || id === FLATNESS_ID) {
      if (!has('z')) errors.push({ row, featureId: id, column: 'z', message: `${id} needs z (${id === FLATNESS_ID ? 'the flatness reading' : 'the measured thickness'}, mm)` });
      if (has('diameter') || has('depth')) errors.push({ row, featureId: id, column: has('diameter') ? 'diameter' : 'depth', message: `${id} takes z only (and x, y where it was taken)` });
    } else if (FLATNESS_POINT_ID_RE.test(id)) {
      for (const k of ['x', 'y', 'z'] as const) if (!has(k)) errors.push({ row, featureId: id, column: k, message: `flatness point ${id} needs x, y and z` });
    } else {
      if (has('x') !== has('y')) errors.push({ row, featureId: id, column: has('x') ? 'y' : 'x', message: `${id}: give both x and y of the centre, or neither` });
      if (!has('x') && !has('diameter') && !has('depth')) errors.push({ row, featureId: id, message: `${id}: no value given (x, y, diameter or depth)` });
      if (has('z')) errors.push({ row, featureId: id, column: 'z', message: `${id} is a hole: give x, y, diameter, depth (z is for THK/FP/FLAT rows)` });
    }
  });
  return errors;
}
