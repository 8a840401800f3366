/**
 * Our layer plan for the cut file: one layer per machining operation. Names are ours, ASCII,
 * and legal in DXF (no < > / \ " : ; ? * | = `); thread and fit designations are folded in.
 */
import type { PlateProfile, PlateSide, ProfileHole, ProfilePocket } from '../profileTypes';

export interface LayerSpec {
  readonly name: string;
  /** AutoCAD colour index, for telling layers apart on screen */
  readonly aci: number;
  /** human description, for the drawing's legend */
  readonly description: string;
}

const SIDE_CODE: Record<PlateSide, string> = { engine: 'ENG', transmission: 'TRN' };

export function dxfSafe(s: string): string {
  return s
    .trim()
    .replace(/[<>/\\":;?*|=`,]/g, '_')
    .replace(/\s+/g, '_')
    .toUpperCase();
}

function mm(v: number): string {
  return `${Math.round(v * 1000) / 1000}`;
}

function blindSuffix(side: PlateSide, depthMm: number | null): string {
  return depthMm === null ? '' : `_${SIDE_CODE[side]}_${mm(depthMm)}DP`;
}

export const OUTLINE_LAYER: LayerSpec = { name: 'PW_CUT_THRU', aci: 7, description: 'outline and clearance holes, cut through' };
export const ENGRAVE_LAYER: LayerSpec = { name: 'PW_ENGRAVE', aci: 6, description: 'engraving: part number and revision' };

export function holeLayer(h: ProfileHole): LayerSpec {
  switch (h.operation) {
    case 'through':
      return h.depthMm === null ? OUTLINE_LAYER : { name: `PW_DRILL${blindSuffix(h.fromSide, h.depthMm)}`, aci: 7, description: 'blind drill' };
    case 'tapDrill':
      return {
        name: `PW_TAPDRILL_${dxfSafe(h.thread ?? 'UNSPECIFIED')}${blindSuffix(h.fromSide, h.depthMm)}`,
        aci: 3,
        description: `tap drill for ${h.thread ?? 'thread'}${h.depthMm === null ? ', through' : `, ${mm(h.depthMm)} deep from the ${h.fromSide} side`}`,
      };
    case 'dowelReam':
      return {
        name: `PW_REAM_${dxfSafe(h.fit?.designation ?? 'FIT')}${blindSuffix(h.fromSide, h.depthMm)}`,
        aci: 1,
        description: `reamed dowel hole ${h.fit?.designation ?? ''}`.trim(),
      };
    case 'centreBore':
      return { name: `PW_BORE_CENTRE${h.fit ? `_${dxfSafe(h.fit.designation)}` : ''}${blindSuffix(h.fromSide, h.depthMm)}`, aci: 5, description: 'centre bore' };
    case 'starterBore':
      return { name: `PW_BORE_STARTER${h.fit ? `_${dxfSafe(h.fit.designation)}` : ''}${blindSuffix(h.fromSide, h.depthMm)}`, aci: 5, description: 'starter nose bore' };
  }
}

export function counterboreLayer(h: ProfileHole): LayerSpec {
  const cb = h.counterbore!;
  return {
    name: `PW_CBORE_${SIDE_CODE[cb.fromSide]}_${mm(cb.depthMm)}DP`,
    aci: 4,
    description: `counterbore, ${mm(cb.depthMm)} deep from the ${cb.fromSide} side`,
  };
}

export function pocketLayer(p: ProfilePocket): LayerSpec {
  return {
    name: `PW_POCKET_${SIDE_CODE[p.fromSide]}_${mm(p.depthMm)}DP`,
    aci: 2,
    description: `pocket, ${mm(p.depthMm)} deep from the ${p.fromSide} side`,
  };
}

/** Every layer the profile needs, in a stable order. */
export function layerPlan(profile: PlateProfile): LayerSpec[] {
  const map = new Map<string, LayerSpec>();
  map.set(OUTLINE_LAYER.name, OUTLINE_LAYER);
  for (const h of profile.holes) {
    const l = holeLayer(h);
    map.set(l.name, l);
    if (h.counterbore) {
      const c = counterboreLayer(h);
      map.set(c.name, c);
    }
  }
  for (const p of profile.pockets) {
    const l = pocketLayer(p);
    map.set(l.name, l);
  }
  map.set(ENGRAVE_LAYER.name, ENGRAVE_LAYER);
  return [...map.values()];
}
