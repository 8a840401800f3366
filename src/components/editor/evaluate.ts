/** What the editor derives from the document on every edit: validity, profile, findings. */
import { checkPlate, plateSpecSchema, resolvePlate, specIssues, type Finding, type PlateProfile, type PlateSpec, type PlateSpecInput, type SpecIssue } from '~/domain';
import { isDomainError } from '~/domain/errors';

export interface Evaluation {
  readonly spec: PlateSpec | null;
  readonly profile: PlateProfile | null;
  readonly findings: readonly Finding[];
  readonly issues: readonly SpecIssue[];
  readonly issueMap: ReadonlyMap<string, string>;
  readonly ms: number;
}

export function evaluateDoc(doc: PlateSpecInput): Evaluation {
  const t0 = performance.now();
  const parsed = plateSpecSchema.safeParse(doc);
  if (!parsed.success) {
    const issues = specIssues(parsed.error);
    return { spec: null, profile: null, findings: [], issues, issueMap: new Map(issues.map((i) => [i.path, i.message])), ms: performance.now() - t0 };
  }
  try {
    const profile = resolvePlate(parsed.data).profile;
    const findings = checkPlate(parsed.data);
    return { spec: parsed.data, profile, findings, issues: [], issueMap: new Map(), ms: performance.now() - t0 };
  } catch (e) {
    if (!isDomainError(e)) throw e;
    const path = (e.path ?? []).join('.') || '(spec)';
    const issues = [{ path, pathSegments: e.path ?? [], message: e.message }];
    return { spec: parsed.data, profile: null, findings: [], issues, issueMap: new Map([[path, e.message]]), ms: performance.now() - t0 };
  }
}
