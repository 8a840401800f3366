/**
 * The cut file: DXF (AC1021, as dxf-writer writes it), 1:1 in millimetres ($INSUNITS 4), plate
 * coordinates seen from the transmission side. The outline is one closed LWPOLYLINE whose arcs
 * are true arcs (bulges); every round feature is a CIRCLE on its operation's layer; pockets are
 * closed LWPOLYLINEs on their own layer; the part number and revision are one TEXT on the
 * engraving layer. Nothing else: no title block, no dimensions.
 */
import Drawing from 'dxf-writer';
import type { OutlineSegment, PlateProfile } from '../profileTypes';
import { segmentBulge } from './outlineMath';
import { ENGRAVE_LAYER, OUTLINE_LAYER, counterboreLayer, holeLayer, layerPlan, pocketLayer } from './layers';
import { engravingText, placeEngraving } from './engraving';

export interface DxfMeta {
  readonly partNumber: string;
  readonly revision: string | number;
}

/** [x, y, bulge] per vertex; dxf-writer writes the third value as the bulge (group 42). */
function polylinePoints(chain: readonly OutlineSegment[]): [number, number][] {
  return chain.map((s) => [s.start.x, s.start.y, segmentBulge(s)]) as unknown as [number, number][];
}

export function plateDxf(profile: PlateProfile, meta: DxfMeta): string {
  const d = new Drawing();
  d.setUnits('Millimeters');
  for (const l of layerPlan(profile)) d.addLayer(l.name, l.aci, 'CONTINUOUS');

  d.setActiveLayer(OUTLINE_LAYER.name);
  d.drawPolyline(polylinePoints(profile.outline), true);

  for (const h of profile.holes) {
    d.setActiveLayer(holeLayer(h).name);
    d.drawCircle(h.center.x, h.center.y, h.diameterMm / 2);
    if (h.counterbore) {
      d.setActiveLayer(counterboreLayer(h).name);
      d.drawCircle(h.center.x, h.center.y, h.counterbore.diameterMm / 2);
    }
  }
  for (const p of profile.pockets) {
    d.setActiveLayer(pocketLayer(p).name);
    d.drawPolyline(polylinePoints(p.outline), true);
  }
  const text = engravingText(meta);
  const place = placeEngraving(profile, text);
  if (place) {
    d.setActiveLayer(ENGRAVE_LAYER.name);
    d.drawText(place.x, place.y, place.heightMm, 0, text, 'center', 'middle');
  }
  return d.toDxfString();
}
