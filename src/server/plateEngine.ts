import { createHash } from 'node:crypto';
import { checkPlate, parsePlateSpec, plateProfile, type PlateSpec } from '~/domain';
import { isDomainError } from '~/domain/errors';
import { canonicalJson } from '~/domain/canonicalJson';
import { AppError } from './errors';

/** The spec as the domain accepts it, or a 400 that names every problem by its path. */
export function validateSpec(raw: unknown): PlateSpec {
  try {
    return parsePlateSpec(raw);
  } catch (e) {
    if (isDomainError(e)) throw new AppError(400, 'invalid_spec', e.message, e.path ? { path: e.path.join('.') } : {});
    throw e;
  }
}

export function specSha256(spec: unknown): string {
  return createHash('sha256').update(canonicalJson(spec)).digest('hex');
}

export type Finding = ReturnType<typeof checkPlate>[number];

/** Findings at save time; a spec the checks cannot even lay out is itself an error finding. */
export function runChecks(spec: PlateSpec): Finding[] {
  try {
    return checkPlate(spec);
  } catch (e) {
    const message = e instanceof Error ? e.message : String(e);
    return [{ code: 'layout.failed', severity: 'error', message: `The plate could not be laid out: ${message}`, featureIds: [], rule: 'The plate must be computable before it can be checked', source: 'common practice' } as Finding];
  }
}

export function profileOf(spec: PlateSpec) {
  return plateProfile(spec);
}
