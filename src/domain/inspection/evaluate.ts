/**
 * As-machined results against the plan: per hole true position and size (and depth where it
 * has one), per face the fitted bolt-circle centre against the datum, thickness range and
 * flatness; an overall result. Pure; the browser's live colouring and the server's stored
 * result are this same function.
 */
import { fitCircle } from '../fit/circle';
import { fitPlane } from '../fit/plane';
import type { MeasurementRow } from './measurements';
import { FLATNESS_ID, FLATNESS_POINT_ID_RE, THICKNESS_ID_RE, type InspectionPlan, type Limit } from './plan';
import { positionDeviation, withinLimits, withinZone } from './truePosition';

export type FeatureOutcome = 'pass' | 'fail' | 'not_measured';
export type OverallOutcome = 'passed' | 'failed' | 'incomplete';

export interface HoleResult {
  readonly kind: 'hole';
  readonly featureId: string;
  readonly operation: string;
  readonly nominal: { readonly x: number; readonly y: number; readonly diameterMm: number; readonly depthMm: number | null };
  readonly measured: { readonly x?: number; readonly y?: number; readonly diameter?: number; readonly depth?: number };
  readonly dxMm: number | null;
  readonly dyMm: number | null;
  readonly truePositionMm: number | null;
  readonly positionToleranceMm: number;
  readonly positionSource: string;
  /** measured − nominal diameter */
  readonly sizeDeviationMm: number | null;
  readonly size: Limit;
  readonly depthDeviationMm: number | null;
  readonly depthLimit: InspectionPlan['holes'][number]['depth'];
  readonly result: FeatureOutcome;
  /** why it failed or is not complete, in words */
  readonly notes: readonly string[];
}

export interface PatternResult {
  readonly kind: 'pattern';
  readonly featureId: string;
  readonly face: 'engine' | 'transmission';
  readonly measuredHoles: number;
  readonly nominalCentre: { readonly x: number; readonly y: number };
  readonly fittedCentre: { readonly x: number; readonly y: number } | null;
  readonly nominalDiameterMm: number;
  readonly fittedDiameterMm: number | null;
  /** 2 × centre offset (diameter-zone form, the TIR the offset causes) */
  readonly concentricityMm: number | null;
  readonly toleranceMm: number;
  readonly source: string;
  readonly result: FeatureOutcome;
  readonly notes: readonly string[];
}

export interface ThicknessResult {
  readonly kind: 'thickness';
  readonly featureId: 'THK';
  readonly nominalMm: number;
  readonly limit: Limit;
  readonly points: readonly { readonly featureId: string; readonly valueMm: number; readonly pass: boolean }[];
  readonly minMm: number | null;
  readonly maxMm: number | null;
  /** max − min */
  readonly rangeMm: number | null;
  readonly result: FeatureOutcome;
  readonly notes: readonly string[];
}

export interface FlatnessResult {
  readonly kind: 'flatness';
  readonly featureId: 'FLAT';
  readonly toleranceMm: number;
  readonly source: string;
  /** the reading, when given */
  readonly readingMm: number | null;
  /** max − min distance from the least-squares plane of the FP points, when ≥ 3 */
  readonly fittedMm: number | null;
  readonly points: number;
  /** the worse of the two */
  readonly flatnessMm: number | null;
  readonly result: FeatureOutcome;
  readonly notes: readonly string[];
}

export type FeatureResult = HoleResult | PatternResult | ThicknessResult | FlatnessResult;

export interface InspectionResult {
  readonly features: readonly FeatureResult[];
  readonly overall: OverallOutcome;
  readonly counts: { readonly pass: number; readonly fail: number; readonly notMeasured: number };
  readonly failing: readonly string[];
}

const f3 = (v: number) => v.toFixed(3);

function evaluateHole(h: InspectionPlan['holes'][number], r: MeasurementRow | undefined): HoleResult {
  const notes: string[] = [];
  let fail = false;
  let missing = false;
  let dx: number | null = null;
  let dy: number | null = null;
  let tp: number | null = null;
  if (r?.x !== undefined && r.y !== undefined) {
    const d = positionDeviation(h.nominal, { x: r.x, y: r.y });
    dx = d.dxMm;
    dy = d.dyMm;
    tp = d.truePositionMm;
    if (!withinZone(tp, h.positionToleranceMm)) {
      fail = true;
      notes.push(`position Ø${f3(tp)} exceeds the zone Ø${f3(h.positionToleranceMm)}`);
    }
  } else {
    missing = true;
    notes.push('position not measured');
  }
  let sizeDev: number | null = null;
  if (r?.diameter !== undefined) {
    sizeDev = r.diameter - h.diameterMm;
    if (!withinLimits(r.diameter, h.size.lowerMm, h.size.upperMm)) {
      fail = true;
      notes.push(`Ø${f3(r.diameter)} outside ${h.size.label} (${f3(h.size.lowerMm)}…${f3(h.size.upperMm)})`);
    }
  } else if (h.sizeRequired) {
    missing = true;
    notes.push(`Ø not measured (fitted feature, ${h.size.label})`);
  }
  let depthDev: number | null = null;
  if (r?.depth !== undefined) {
    if (h.depth) {
      depthDev = r.depth - h.depth.nominalMm;
      if (!withinLimits(r.depth, h.depth.lowerMm, h.depth.upperMm)) {
        fail = true;
        notes.push(`${h.depth.what} depth ${f3(r.depth)} outside ${f3(h.depth.lowerMm)}…${f3(h.depth.upperMm)}`);
      }
    } else notes.push('through hole: depth not checked');
  }
  return Object.freeze({
    kind: 'hole',
    featureId: h.id,
    operation: h.operation,
    nominal: { x: h.nominal.x, y: h.nominal.y, diameterMm: h.diameterMm, depthMm: h.depth?.nominalMm ?? null },
    measured: r ? { ...(r.x !== undefined ? { x: r.x } : {}), ...(r.y !== undefined ? { y: r.y } : {}), ...(r.diameter !== undefined ? { diameter: r.diameter } : {}), ...(r.depth !== undefined ? { depth: r.depth } : {}) } : {},
    dxMm: dx,
    dyMm: dy,
    truePositionMm: tp,
    positionToleranceMm: h.positionToleranceMm,
    positionSource: h.positionSource,
    sizeDeviationMm: sizeDev,
    size: h.size,
    depthDeviationMm: depthDev,
    depthLimit: h.depth,
    result: fail ? 'fail' : missing ? 'not_measured' : 'pass',
    notes: Object.freeze(notes),
  } as const);
}

function evaluatePattern(p: InspectionPlan['patterns'][number], byId: ReadonlyMap<string, MeasurementRow>): PatternResult {
  const pts = p.holeIds.map((id) => byId.get(id)).filter((r): r is MeasurementRow & { x: number; y: number } => r?.x !== undefined && r.y !== undefined);
  const base = { kind: 'pattern' as const, featureId: p.id, face: p.face, measuredHoles: pts.length, nominalCentre: p.nominalCentre, nominalDiameterMm: p.nominalDiameterMm, toleranceMm: p.toleranceMm, source: p.source };
  if (pts.length < 3) {
    return Object.freeze({ ...base, fittedCentre: null, fittedDiameterMm: null, concentricityMm: null, result: 'not_measured', notes: [`needs at least 3 measured hole centres of the ${p.face} pattern, has ${pts.length}`] });
  }
  // bolt patterns on flanges are often irregular in angle: the centre comes from the circle fit alone
  const c = fitCircle(pts, { method: 'geometric' });
  const fit = { centerX: c.centerX, centerY: c.centerY, diameterMm: 2 * c.radius };
  const ex = fit.centerX - p.nominalCentre.x;
  const ey = fit.centerY - p.nominalCentre.y;
  const conc = 2 * Math.hypot(ex, ey);
  const ok = withinZone(conc, p.toleranceMm);
  return Object.freeze({
    ...base,
    fittedCentre: { x: fit.centerX, y: fit.centerY },
    fittedDiameterMm: fit.diameterMm,
    concentricityMm: conc,
    result: ok ? 'pass' : 'fail',
    notes: ok ? [] : [`fitted ${p.face} bolt-circle centre is ${f3(conc / 2)} off the datum (Ø${f3(conc)} > Ø${f3(p.toleranceMm)})`],
  });
}

export function evaluateInspection(plan: InspectionPlan, rows: readonly MeasurementRow[]): InspectionResult {
  const byId = new Map(rows.map((r) => [r.featureId, r] as const));
  const features: FeatureResult[] = [];
  for (const h of plan.holes) features.push(evaluateHole(h, byId.get(h.id)));
  for (const p of plan.patterns) features.push(evaluatePattern(p, byId));

  // thickness
  const t = plan.thickness;
  const thk = rows.filter((r) => THICKNESS_ID_RE.test(r.featureId) && r.z !== undefined).map((r) => ({ featureId: r.featureId, valueMm: r.z!, pass: withinLimits(r.z!, t.lowerMm, t.upperMm) }));
  const values = thk.map((p) => p.valueMm);
  const thkFail = thk.filter((p) => !p.pass);
  features.push(
    Object.freeze({
      kind: 'thickness',
      featureId: 'THK',
      nominalMm: t.nominalMm,
      limit: { lowerMm: t.lowerMm, upperMm: t.upperMm, label: t.label, source: t.source },
      points: thk,
      minMm: values.length ? Math.min(...values) : null,
      maxMm: values.length ? Math.max(...values) : null,
      rangeMm: values.length ? Math.max(...values) - Math.min(...values) : null,
      result: thkFail.length ? 'fail' : thk.length ? 'pass' : 'not_measured',
      notes: thkFail.length ? thkFail.map((p) => `${p.featureId} ${f3(p.valueMm)} outside ${f3(t.lowerMm)}…${f3(t.upperMm)}`) : thk.length ? [] : ['no thickness measured (THK1…)'],
    } as const),
  );

  // flatness
  const fl = plan.flatness;
  const reading = byId.get(FLATNESS_ID)?.z ?? null;
  const fp = rows.filter((r) => FLATNESS_POINT_ID_RE.test(r.featureId) && r.x !== undefined && r.y !== undefined && r.z !== undefined).map((r) => ({ x: r.x!, y: r.y!, z: r.z! }));
  const notes: string[] = [];
  let fitted: number | null = null;
  if (fp.length >= 3) {
    try {
      fitted = fitPlane(fp).flatness;
    } catch (e) {
      notes.push(`flatness points do not span a plane: ${e instanceof Error ? e.message : String(e)}`);
    }
  } else if (fp.length > 0) notes.push(`flatness points: ${fp.length} given, a plane needs at least 3`);
  const candidates = [reading, fitted].filter((v): v is number => v !== null);
  const flatness = candidates.length ? Math.max(...candidates) : null;
  const flatOk = flatness !== null && withinZone(flatness, fl.toleranceMm);
  if (flatness === null) notes.push('flatness not measured (FLAT reading or FP1… points)');
  else if (!flatOk) notes.push(`flatness ${f3(flatness)} exceeds ${f3(fl.toleranceMm)}`);
  features.push(
    Object.freeze({
      kind: 'flatness',
      featureId: 'FLAT',
      toleranceMm: fl.toleranceMm,
      source: fl.source,
      readingMm: reading,
      fittedMm: fitted,
      points: fp.length,
      flatnessMm: flatness,
      result: flatness === null ? 'not_measured' : flatOk ? 'pass' : 'fail',
      notes,
    } as const),
  );

  const counts = { pass: 0, fail: 0, notMeasured: 0 };
  for (const f of features) {
    if (f.result === 'pass') counts.pass++;
    else if (f.result === 'fail') counts.fail++;
    else counts.notMeasured++;
  }
  const failing = features.filter((f) => f.result === 'fail').map((f) => f.featureId);
  return Object.freeze({
    features: Object.freeze(features),
    overall: counts.fail > 0 ? 'failed' : counts.notMeasured > 0 ? 'incomplete' : 'passed',
    counts: Object.freeze(counts),
    failing: Object.freeze(failing),
  });
}

/** The short per-feature form the API answers with. */
export function resultSummary(f: FeatureResult): { featureId: string; truePositionMm: number | null; sizeDeviationMm: number | null; result: FeatureOutcome } {
  return {
    featureId: f.featureId,
    truePositionMm: f.kind === 'hole' ? f.truePositionMm : f.kind === 'pattern' ? f.concentricityMm : null,
    sizeDeviationMm: f.kind === 'hole' ? f.sizeDeviationMm : null,
    result: f.result,
  };
}
