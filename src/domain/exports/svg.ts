/**
 * SVG preview of the cut file: the same geometry as the DXF (outline and pockets as paths with
 * true arcs, round features as circles, one group per layer), in millimetres, with y flipped so
 * the plate reads as seen from the transmission side with +Y up.
 */
import type { OutlineSegment, PlateProfile } from '../profileTypes';
import { arcSweepRad, pointOnSegment } from './outlineMath';
import { ENGRAVE_LAYER, OUTLINE_LAYER, counterboreLayer, holeLayer, layerPlan, pocketLayer, type LayerSpec } from './layers';
import { engravingText, placeEngraving } from './engraving';

export interface SvgOptions {
  readonly partNumber?: string;
  readonly revision?: string | number;
  /** stroke width in mm (default 0.35) */
  readonly strokeMm?: number;
  /** margin around the plate in mm (default 10) */
  readonly marginMm?: number;
  /** draw the datum cross at the origin (default true) */
  readonly datum?: boolean;
}

const LAYER_COLOURS: Record<number, string> = {
  1: '#c0392b',
  2: '#b7950b',
  3: '#1e8449',
  4: '#148f9b',
  5: '#2e4fa3',
  6: '#8e44ad',
  7: '#1b1f24',
};

function n(v: number): string {
  const r = Math.round(v * 1e6) / 1e6;
  return Object.is(r, -0) ? '0' : String(r);
}

function esc(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

/** Path data of a closed chain, y flipped; arcs as `A` commands (full circles split in two). */
export function chainPathData(chain: readonly OutlineSegment[]): string {
  const parts: string[] = [];
  const first = chain[0]!;
  parts.push(`M${n(first.start.x)} ${n(-first.start.y)}`);
  for (const s of chain) {
    if (s.kind === 'line') {
      parts.push(`L${n(s.end.x)} ${n(-s.end.y)}`);
      continue;
    }
    const sweep = arcSweepRad(s);
    // y is negated, so the plate reads the right way up: a ccw arc still looks counter-clockwise,
    // which in SVG's y-down frame is the negative-angle direction (sweep-flag 0)
    const sweepFlag = sweep > 0 ? 0 : 1;
    const r = n(s.radiusMm);
    if (Math.abs(sweep) > Math.PI + 1e-9) {
      const mid = pointOnSegment(s, 0.5);
      parts.push(`A${r} ${r} 0 0 ${sweepFlag} ${n(mid.x)} ${n(-mid.y)}`);
      parts.push(`A${r} ${r} 0 0 ${sweepFlag} ${n(s.end.x)} ${n(-s.end.y)}`);
    } else {
      parts.push(`A${r} ${r} 0 0 ${sweepFlag} ${n(s.end.x)} ${n(-s.end.y)}`);
    }
  }
  parts.push('Z');
  return parts.join(' ');
}

export function plateSvg(profile: PlateProfile, opts: SvgOptions = {}): string {
  const stroke = opts.strokeMm ?? 0.35;
  const m = opts.marginMm ?? 10;
  const { minX, minY, maxX, maxY } = profile.bbox;
  const vbX = minX - m;
  const vbY = -maxY - m;
  const vbW = maxX - minX + 2 * m;
  const vbH = maxY - minY + 2 * m;
  const groups = new Map<string, { spec: LayerSpec; items: string[] }>();
  for (const l of layerPlan(profile)) groups.set(l.name, { spec: l, items: [] });
  const add = (l: LayerSpec, item: string) => groups.get(l.name)!.items.push(item);

  add(OUTLINE_LAYER, `<path data-id="outline" d="${chainPathData(profile.outline)}"/>`);
  for (const h of profile.holes) {
    add(holeLayer(h), `<circle data-id="${esc(h.id)}" cx="${n(h.center.x)}" cy="${n(-h.center.y)}" r="${n(h.diameterMm / 2)}"/>`);
    if (h.counterbore) {
      add(
        counterboreLayer(h),
        `<circle data-id="${esc(h.id)}" cx="${n(h.center.x)}" cy="${n(-h.center.y)}" r="${n(h.counterbore.diameterMm / 2)}"/>`,
      );
    }
  }
  for (const p of profile.pockets) add(pocketLayer(p), `<path data-id="${esc(p.id)}" d="${chainPathData(p.outline)}"/>`);
  if (opts.partNumber !== undefined && opts.revision !== undefined) {
    const text = engravingText({ partNumber: opts.partNumber, revision: opts.revision });
    const place = placeEngraving(profile, text);
    if (place) {
      add(
        ENGRAVE_LAYER,
        `<text x="${n(place.x)}" y="${n(-place.y)}" font-size="${n(place.heightMm)}" text-anchor="middle" dominant-baseline="central" font-family="'Source Sans 3', sans-serif" stroke="none" fill="${LAYER_COLOURS[ENGRAVE_LAYER.aci]}">${esc(text)}</text>`,
      );
    }
  }

  const out: string[] = [];
  out.push(
    `<svg xmlns="http://www.w3.org/2000/svg" viewBox="${n(vbX)} ${n(vbY)} ${n(vbW)} ${n(vbH)}" width="${n(vbW)}mm" height="${n(vbH)}mm">`,
  );
  out.push(`<title>${esc(opts.partNumber ? `${opts.partNumber} rev ${opts.revision ?? ''}`.trim() : 'plate')}</title>`);
  out.push(`<g fill="none" stroke-width="${n(stroke)}" stroke-linejoin="round">`);
  for (const { spec, items } of groups.values()) {
    if (items.length === 0) continue;
    out.push(`<g data-layer="${esc(spec.name)}" stroke="${LAYER_COLOURS[spec.aci] ?? '#1b1f24'}">`);
    out.push(...items);
    out.push('</g>');
  }
  if (opts.datum !== false) {
    const a = Math.min(15, (maxX - minX) / 20);
    out.push(
      `<g data-layer="datum" stroke="#6b7280" stroke-width="${n(stroke / 2)}"><path d="M${n(-a)} 0 H${n(a)} M0 ${n(-a)} V${n(a)}"/></g>`,
    );
  }
  out.push('</g>', '</svg>');
  return out.join('\n');
}
