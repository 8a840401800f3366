import type { OutlineSegment, PlateProfile, ProfileHole } from '~/domain/profileTypes';
import { chainPathData } from '~/domain/exports/svg';

export type HoleMark = 'added' | 'removed' | 'moved' | 'changed' | undefined;

const MARK_STYLE: Record<Exclude<HoleMark, undefined>, { stroke: string; fill: string; dash?: string }> = {
  added: { stroke: '#127a4a', fill: 'rgba(18,122,74,0.18)' },
  removed: { stroke: '#c2372b', fill: 'rgba(194,55,43,0.15)', dash: '3 2' },
  moved: { stroke: '#c98a00', fill: 'rgba(201,138,0,0.2)' },
  changed: { stroke: '#7a4ab0', fill: 'rgba(122,74,176,0.18)' },
};

/** SVG path of a closed outline of lines and true arcs (y flipped), the same path the SVG export writes. */
export const outlinePath = (segments: readonly OutlineSegment[]): string => (segments.length ? chainPathData(segments) : '');

const FACE_STYLE: Record<ProfileHole['face'], { stroke: string; fill: string }> = {
  engine: { stroke: '#1d3a4a', fill: '#ffffff' },
  transmission: { stroke: '#b9811a', fill: '#fff8e8' },
  plate: { stroke: '#4f8199', fill: '#ffffff' },
};

/** A read-only drawing of the plate: outline, holes by face, datum cross; optional highlight marks. */
export function PlateDrawing({ profile, marks = {}, ghosts = [], title, height = 360 }: { profile: PlateProfile; marks?: Record<string, HoleMark>; ghosts?: ProfileHole[]; title?: string; height?: number }) {
  const b = profile.bbox;
  const pad = 12;
  const vb = `${b.minX - pad} ${-b.maxY - pad} ${b.maxX - b.minX + 2 * pad} ${b.maxY - b.minY + 2 * pad}`;
  const cross = Math.max(b.maxX - b.minX, b.maxY - b.minY) * 0.06;
  return (
    <svg viewBox={vb} role="img" aria-label={title ?? 'plate drawing'} style={{ width: '100%', height }} className="rounded border border-blast-200 bg-blast-50">
      <path d={outlinePath(profile.outline)} fill="#e3eef3" stroke="#1d3a4a" strokeWidth={0.8} />
      {profile.pockets.map((p) => (
        <path key={p.id} d={outlinePath(p.outline)} fill="#cfdde4" stroke="#4f8199" strokeWidth={0.5} strokeDasharray="2 1.5" />
      ))}
      <g stroke="#c2372b" strokeWidth={0.4}>
        <line x1={-cross} y1={0} x2={cross} y2={0} />
        <line x1={0} y1={-cross} x2={0} y2={cross} />
      </g>
      {profile.holes.map((h) => {
        const m = marks[h.id];
        const face = FACE_STYLE[h.face];
        const st = m ? MARK_STYLE[m] : undefined;
        return (
          <g key={h.id} data-hole={h.id} data-mark={m}>
            {h.counterbore && <circle cx={h.center.x} cy={-h.center.y} r={h.counterbore.diameterMm / 2} fill="none" stroke={face.stroke} strokeWidth={0.35} strokeDasharray="1.5 1" />}
            <circle cx={h.center.x} cy={-h.center.y} r={h.diameterMm / 2} fill={st?.fill ?? face.fill} stroke={st?.stroke ?? face.stroke} strokeWidth={st ? 1.2 : 0.6} />
            {m && <circle cx={h.center.x} cy={-h.center.y} r={h.diameterMm / 2 + 3} fill="none" stroke={st!.stroke} strokeWidth={0.8} />}
          </g>
        );
      })}
      {ghosts.map((h) => (
        <circle key={`ghost-${h.id}`} data-ghost={h.id} cx={h.center.x} cy={-h.center.y} r={h.diameterMm / 2} fill="none" stroke="#c2372b" strokeWidth={0.9} strokeDasharray="3 2" />
      ))}
    </svg>
  );
}
