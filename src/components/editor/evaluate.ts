/**
 * What the editor derives from the document on every edit, in two steps so a keystroke reaches
 * the drawing first: `layoutDoc` (schema + plate profile, what the drawing needs) runs in the
 * keystroke's own render; `checkLayout` (every design check, the larger part of the work) runs
 * in a deferred render right after, and its findings follow within a frame.
 */
import { checkPlate, plateSpecSchema, resolvePlate, specIssues, type Finding, type PlateProfile, type PlateSpec, type PlateSpecInput, type SpecIssue } from '~/domain';
import { isDomainError } from '~/domain/errors';
import type { ResolvedPlate } from '~/domain/profile';

export interface Layout {
  readonly spec: PlateSpec | null;
  /** the laid-out plate, kept for the checks (they need the same resolution) */
  readonly resolved: ResolvedPlate | null;
  readonly profile: PlateProfile | null;
  readonly issues: readonly SpecIssue[];
  readonly issueMap: ReadonlyMap<string, string>;
  readonly ms: number;
}

export interface Checked {
  /** the layout these findings belong to */
  readonly layout: Layout;
  readonly findings: readonly Finding[];
  readonly ms: number;
}

export interface Evaluation {
  readonly spec: PlateSpec | null;
  readonly profile: PlateProfile | null;
  readonly findings: readonly Finding[];
  readonly issues: readonly SpecIssue[];
  readonly issueMap: ReadonlyMap<string, string>;
  readonly ms: number;
}

const NO_ISSUES: ReadonlyMap<string, string> = new Map();

function problem(e: unknown): { issues: SpecIssue[]; issueMap: Map<string, string> } {
  if (!isDomainError(e)) throw e;
  const path = (e.path ?? []).join('.') || '(spec)';
  return { issues: [{ path, pathSegments: e.path ?? [], message: e.message }], issueMap: new Map([[path, e.message]]) };
}

/** Schema and plate profile: everything the drawing needs. */
export function layoutDoc(doc: PlateSpecInput): Layout {
  const t0 = performance.now();
  const parsed = plateSpecSchema.safeParse(doc);
  if (!parsed.success) {
    const issues = specIssues(parsed.error);
    return { spec: null, resolved: null, profile: null, issues, issueMap: new Map(issues.map((i) => [i.path, i.message])), ms: performance.now() - t0 };
  }
  try {
    const resolved = resolvePlate(parsed.data);
    return { spec: parsed.data, resolved, profile: resolved.profile, issues: [], issueMap: NO_ISSUES, ms: performance.now() - t0 };
  } catch (e) {
    return { spec: parsed.data, resolved: null, profile: null, ...problem(e), ms: performance.now() - t0 };
  }
}

/** Every design check of a laid-out plate (none when it could not be laid out). */
export function checkLayout(layout: Layout): Checked {
  const t0 = performance.now();
  if (!layout.spec || !layout.resolved) return { layout, findings: [], ms: 0 };
  try {
    return { layout, findings: checkPlate(layout.spec, layout.resolved), ms: performance.now() - t0 };
  } catch (e) {
    if (!isDomainError(e)) throw e;
    return { layout, findings: [], ms: performance.now() - t0 };
  }
}

/** Both steps at once (tests, exports). */
export function evaluateDoc(doc: PlateSpecInput): Evaluation {
  const layout = layoutDoc(doc);
  const checked = checkLayout(layout);
  return { spec: layout.spec, profile: layout.profile, findings: checked.findings, issues: layout.issues, issueMap: layout.issueMap, ms: layout.ms + checked.ms };
}
