/**
 * Where the part number and revision are engraved: the lowest free spot, nearest the plate's
 * vertical centre line, clear of every feature, the pockets and the outline (with a margin). Pure; the DXF, SVG and drawing all place it the same way.
 */
import type { PlateProfile, Point2 } from '../profileTypes';
import { chainPolygon, distanceToSegmentMm, pointInChain } from './outlineMath';

export interface EngravingPlacement {
  readonly text: string;
  /** centre of the text box, plate coordinates */
  readonly x: number;
  readonly y: number;
  readonly heightMm: number;
  readonly widthMm: number;
}

export function engravingText(meta: { partNumber: string; revision: string | number }): string {
  return `${meta.partNumber} REV ${meta.revision}`;
}

/** Width of a line of engraved capitals, estimated at 0.7 × height per character (common practice). */
export function engravingWidthMm(text: string, heightMm: number): number {
  return text.length * heightMm * 0.7;
}

export function placeEngraving(profile: PlateProfile, text: string, heightMm = 5, marginMm = 3): EngravingPlacement | null {
  const w = engravingWidthMm(text, heightMm);
  const h = heightMm;
  const { minX, minY, maxX, maxY } = profile.bbox;
  const edgeClear = marginMm + profile.edgeChamferMm;
  const pocketPts = profile.pockets.map((p) => chainPolygon(p.outline));
  const circles = profile.holes.map((hole) => ({
    c: hole.center,
    r: Math.max(hole.diameterMm, hole.counterbore?.diameterMm ?? 0) / 2,
  }));
  const outline = profile.outline;

  const fits = (cx: number, cy: number): boolean => {
    const x0 = cx - w / 2;
    const x1 = cx + w / 2;
    const y0 = cy - h / 2;
    const y1 = cy + h / 2;
    for (const { c, r } of circles) {
      const dx = Math.max(x0 - c.x, 0, c.x - x1);
      const dy = Math.max(y0 - c.y, 0, c.y - y1);
      if (Math.hypot(dx, dy) < r + marginMm) return false;
    }
    for (const poly of pocketPts) {
      for (let i = 0; i < poly.length; i += 2) {
        const px = poly[i]!;
        const py = poly[i + 1]!;
        if (px > x0 - marginMm && px < x1 + marginMm && py > y0 - marginMm && py < y1 + marginMm) return false;
      }
    }
    const probes: Point2[] = [];
    const n = Math.max(2, Math.ceil(w / 2));
    for (let i = 0; i <= n; i++) {
      const x = x0 + ((x1 - x0) * i) / n;
      probes.push({ x, y: y0 }, { x, y: y1 });
    }
    probes.push({ x: x0, y: cy }, { x: x1, y: cy });
    for (const p of probes) {
      if (!pointInChain(outline, p)) return false;
      for (const s of outline) if (distanceToSegmentMm(s, p) < edgeClear) return false;
    }
    for (const p of profile.pockets) if (pointInChain(p.outline, { x: cx, y: cy })) return false;
    return true;
  };

  // lowest free row first, and in a row the spot nearest the vertical centre line
  const cx0 = (minX + maxX) / 2;
  const step = 2.5;
  const reach = (maxX - minX - w) / 2;
  for (let y = minY + h / 2; y <= maxY - h / 2; y += step) {
    for (let i = 0; i * step <= reach + 1e-9; i++) {
      for (const x of i === 0 ? [cx0] : [cx0 + i * step, cx0 - i * step]) {
        if (fits(x, y)) return { text, x: round(x), y: round(y), heightMm: h, widthMm: w };
      }
    }
  }
  return null;
}

function round(v: number): number {
  return Math.round(v * 1000) / 1000;
}
