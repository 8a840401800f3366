/** The demo plate (templates/plates/demo.json, invented) as an inspection plan, and a perfect measurement set. */
import { readFileSync } from 'node:fs';
import { parsePlateSpec, plateProfile } from '../../../src/domain';
import { inspectionPlanFor, type InspectionPlan, type MeasurementRow } from '../../../src/domain/inspection';

export const demoRaw = JSON.parse(readFileSync(new URL('../../../templates/plates/demo.json', import.meta.url), 'utf8'));
export const demoSpec = parsePlateSpec(demoRaw);
export const demoProfile = plateProfile(demoSpec);
export const demoPlan: InspectionPlan = inspectionPlanFor(demoProfile, demoSpec.tolerances, demoRaw);

/** Every hole exactly on nominal, mid-limit size, four thickness points on nominal, a flatness reading of 0.02. */
export function perfectRows(plan: InspectionPlan = demoPlan): MeasurementRow[] {
  return [
    ...plan.holes.map((h) => ({
      featureId: h.id,
      x: h.nominal.x,
      y: h.nominal.y,
      diameter: (h.size.lowerMm + h.size.upperMm) / 2,
      ...(h.depth ? { depth: h.depth.nominalMm } : {}),
    })),
    ...[1, 2, 3, 4].map((i) => ({ featureId: `THK${i}`, z: plan.thickness.nominalMm })),
    { featureId: 'FLAT', z: 0.02 },
  ];
}
