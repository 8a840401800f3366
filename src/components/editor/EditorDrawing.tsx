import { memo, useCallback, useEffect, useMemo, useRef, useState, type PointerEvent as RPointerEvent, type WheelEvent as RWheelEvent } from 'react';
import type { Finding, PlateProfile, ProfileHole, PlateSpecInput } from '~/domain';
import { toPlateCoordinates } from '~/domain/profile';
import { showLength, type DisplayUnits } from '~/domain/editor/units';
import { outlinePath } from '~/components/PlateDrawing';

/** Engine face holes: ink circles on white; transmission face: brass, dashed ring; plate features: steel blue. */
export const FACE_LOOK = {
  engine: { stroke: '#1d3a4a', fill: '#ffffff', ring: undefined, label: 'Engine face' },
  transmission: { stroke: '#9a6a10', fill: '#fff3d6', ring: '4 2.5', label: 'Transmission face' },
  plate: { stroke: '#4f8199', fill: '#f4f9fb', ring: undefined, label: 'Plate (bore, starter)' },
} as const;

const SEV_COLOUR = { error: '#c2372b', warning: '#c98a00', note: '#3f6fb0' } as const;

interface Circle {
  readonly key: string;
  readonly face: 'engine' | 'transmission';
  readonly cx: number;
  readonly cy: number;
  readonly r: number;
}

/** Bolt circles of both faces and the ring-gear pitch circle, in plate coordinates. */
export function guideCircles(doc: PlateSpecInput): { bolt: Circle[]; ringPitchR: number | null; ringCentre: { x: number; y: number } | null } {
  const bolt: Circle[] = [];
  for (const [key, face] of [['engineFace', 'engine'], ['transmissionFace', 'transmission']] as const) {
    const f = doc[key];
    for (const p of f?.patterns ?? []) {
      if (!(p.diameterMm > 0)) continue;
      const c = toPlateCoordinates({ x: p.centerX ?? 0, y: p.centerY ?? 0 }, f.viewedFrom);
      bolt.push({ key: `${key}:${p.id}`, face, cx: c.x, cy: c.y, r: p.diameterMm / 2 });
    }
  }
  let ringPitchR: number | null = null;
  const g = doc.starter?.ringGear;
  if (g && g.teeth > 0) {
    const m = g.moduleMm ?? (g.diametralPitch ? 25.4 / g.diametralPitch : undefined);
    if (m && m > 0) ringPitchR = (g.teeth * m) / 2;
  }
  return { bolt, ringPitchR, ringCentre: ringPitchR ? { x: 0, y: 0 } : null };
}

interface Props {
  profile: PlateProfile;
  doc: PlateSpecInput;
  findings: readonly Finding[];
  units: DisplayUnits;
  hovered: string | null;
  selected: readonly string[];
  selectedFinding: number | null;
  onHover(id: string | null): void;
  onSelect(ids: string[]): void;
  stale: boolean;
  /** corners of an own polygon outline to drag (null: no handles) */
  corners?: readonly { x: number; y: number }[] | null;
  /** a corner dragged to `at` (plate coordinates, mm); one `dragId` per drag */
  onMoveCorner?(index: number, at: { x: number; y: number }, dragId: number): void;
}

/** Dragged corners land on this grid (mm). */
const CORNER_GRID_MM = 0.5;

type View = { x: number; y: number; w: number; h: number };

function fitView(profile: PlateProfile, extra = 0): View {
  // the outline and every feature (a feature outside an own outline stays in view)
  const b = { ...profile.bbox };
  for (const h of profile.holes) {
    const r = (h.counterbore?.diameterMm ?? h.diameterMm) / 2;
    b.minX = Math.min(b.minX, h.center.x - r);
    b.maxX = Math.max(b.maxX, h.center.x + r);
    b.minY = Math.min(b.minY, h.center.y - r);
    b.maxY = Math.max(b.maxY, h.center.y + r);
  }
  const pad = Math.max(b.maxX - b.minX, b.maxY - b.minY) * 0.08 + 8 + extra;
  return { x: b.minX - pad, y: -b.maxY - pad, w: b.maxX - b.minX + 2 * pad, h: b.maxY - b.minY + 2.6 * pad };
}

function EditorDrawingInner({ profile, doc, findings, units, hovered, selected, selectedFinding, onHover, onSelect, stale, corners, onMoveCorner }: Props) {
  const svgRef = useRef<SVGSVGElement>(null);
  const [view, setView] = useState<View | null>(null);
  const drag = useRef<{ px: number; py: number; v: View; moved: boolean } | null>(null);
  const cornerDrag = useRef<{ index: number; id: number } | null>(null);
  const [draggingCorner, setDraggingCorner] = useState<number | null>(null);
  const fitted = useMemo(() => fitView(profile), [profile]);
  const v = view ?? fitted;
  const guides = useMemo(() => guideCircles(doc), [doc]);
  const size = Math.max(v.w, v.h);
  // one screen pixel in drawing units: strokes and labels keep their screen size at any zoom
  const [box, setBox] = useState<{ w: number; h: number }>({ w: 900, h: 700 });
  useEffect(() => {
    const el = svgRef.current;
    if (!el) return;
    const ro = new ResizeObserver(() => {
      const r = el.getBoundingClientRect();
      if (r.width > 0 && r.height > 0) setBox({ w: r.width, h: r.height });
    });
    ro.observe(el);
    return () => ro.disconnect();
  }, []);
  const px = Math.max(v.w / box.w, v.h / box.h);

  const toSvg = useCallback((clientX: number, clientY: number, vv: View) => {
    const el = svgRef.current!;
    const r = el.getBoundingClientRect();
    const scale = Math.max(vv.w / r.width, vv.h / r.height);
    const ox = vv.x + vv.w / 2 - (r.width * scale) / 2;
    const oy = vv.y + vv.h / 2 - (r.height * scale) / 2;
    return { x: ox + (clientX - r.left) * scale, y: oy + (clientY - r.top) * scale, scale };
  }, []);

  const onWheel = (e: RWheelEvent<SVGSVGElement>) => {
    const p = toSvg(e.clientX, e.clientY, v);
    const k = Math.exp(e.deltaY * 0.0015);
    const w = Math.min(Math.max(v.w * k, 10), fitted.w * 8);
    const kk = w / v.w;
    setView({ x: p.x - (p.x - v.x) * kk, y: p.y - (p.y - v.y) * kk, w, h: v.h * kk });
  };
  useEffect(() => {
    const el = svgRef.current;
    if (!el) return;
    const stop = (e: WheelEvent) => e.preventDefault();
    el.addEventListener('wheel', stop, { passive: false });
    return () => el.removeEventListener('wheel', stop);
  }, []);
  const onPointerDown = (e: RPointerEvent<SVGSVGElement>) => {
    const handle = (e.target as Element).closest('[data-corner]');
    if (handle && onMoveCorner) {
      const index = Number(handle.getAttribute('data-corner')) - 1;
      cornerDrag.current = { index, id: Date.now() };
      setDraggingCorner(index);
      (e.currentTarget as Element).setPointerCapture?.(e.pointerId);
      return;
    }
    drag.current = { px: e.clientX, py: e.clientY, v, moved: false };
  };
  const onPointerMove = (e: RPointerEvent<SVGSVGElement>) => {
    const c = cornerDrag.current;
    if (c && onMoveCorner) {
      const p = toSvg(e.clientX, e.clientY, v);
      const snap = (n: number) => Math.round(n / CORNER_GRID_MM) * CORNER_GRID_MM;
      onMoveCorner(c.index, { x: snap(p.x), y: snap(-p.y) }, c.id);
      return;
    }
    const d = drag.current;
    if (!d) return;
    const dx = e.clientX - d.px;
    const dy = e.clientY - d.py;
    if (!d.moved && Math.hypot(dx, dy) < 4) return;
    if (!d.moved) (e.currentTarget as Element).setPointerCapture?.(e.pointerId);
    d.moved = true;
    const { scale } = toSvg(0, 0, d.v);
    setView({ ...d.v, x: d.v.x - dx * scale, y: d.v.y - dy * scale });
  };
  const onPointerUp = (e: RPointerEvent<SVGSVGElement>) => {
    if (cornerDrag.current) {
      cornerDrag.current = null;
      setDraggingCorner(null);
      return;
    }
    const d = drag.current;
    drag.current = null;
    if (d && !d.moved) {
      const target = (e.target as Element).closest('[data-feature]');
      onSelect(target ? [target.getAttribute('data-feature')!] : []);
    }
  };

  const sel = new Set(selected);
  const flagged = new Map<string, keyof typeof SEV_COLOUR>();
  for (const f of findings) {
    for (const id of f.featureIds) {
      const prev = flagged.get(id);
      if (!prev || (prev !== 'error' && f.severity === 'error')) flagged.set(id, f.severity);
    }
  }
  const selHole = profile.holes.find((h) => h.id === (selected[0] ?? hovered));

  return (
    <div className="relative h-full min-h-0 w-full">
      <svg
        ref={svgRef}
        data-testid="plate-drawing"
        role="img"
        aria-label="Plate drawing, seen from the transmission side"
        viewBox={`${v.x} ${v.y} ${v.w} ${v.h}`}
        className="h-full w-full cursor-grab touch-none select-none bg-white active:cursor-grabbing"
        onWheel={onWheel}
        onPointerDown={onPointerDown}
        onPointerMove={onPointerMove}
        onPointerUp={onPointerUp}
        onPointerLeave={() => onHover(null)}
      >
        <path data-testid="outline" d={outlinePath(profile.outline)} fill={stale ? '#eef0f1' : '#e3eef3'} stroke="#1d3a4a" strokeWidth={2 * px} />
        {profile.edgeChamferMm > 0 && <path d={outlinePath(profile.outline)} fill="none" stroke="#8fb7c9" strokeWidth={px} transform="" strokeDasharray={`${6 * px} ${4 * px}`} />}
        {profile.pockets.map((p) => (
          <path key={p.id} data-feature={p.id} d={outlinePath(p.outline)} fill="#cbdce4" stroke="#4f8199" strokeWidth={1.2 * px} strokeDasharray={`${5 * px} ${3 * px}`} />
        ))}
        {guides.bolt.map((c) => (
          <circle key={c.key} cx={c.cx} cy={-c.cy} r={c.r} fill="none" stroke={FACE_LOOK[c.face].stroke} strokeOpacity={0.45} strokeWidth={px} strokeDasharray={`${14 * px} ${4 * px} ${2 * px} ${4 * px}`} />
        ))}
        {guides.ringPitchR && (
          <circle data-testid="ring-pitch" cx={0} cy={0} r={guides.ringPitchR} fill="none" stroke="#7a4ab0" strokeOpacity={0.55} strokeWidth={px} strokeDasharray={`${3 * px} ${3 * px}`} />
        )}
        {profile.holes.map((h) => (
          <HoleMark key={h.id} h={h} px={px} hovered={hovered === h.id} selected={sel.has(h.id)} flag={flagged.get(h.id)} onHover={onHover} />
        ))}

        {/* centre axis and datum */}
        <g stroke="#c2372b" strokeWidth={1.2 * px}>
          <line x1={-40 * px} y1={0} x2={40 * px} y2={0} />
          <line x1={0} y1={-40 * px} x2={0} y2={40 * px} />
        </g>
        <text x={5 * px} y={16 * px} fontSize={13 * px} fill="#c2372b" fontWeight={700} stroke="#ffffff" strokeWidth={3 * px} paintOrder="stroke">
          DATUM A · crank axis (0, 0)
        </text>
        {findings.map((f, i) => (f.at && (f.severity !== 'note' || selectedFinding === i) ? <FindingMark key={i} f={f} px={px} active={selectedFinding === i} /> : null))}
        {selHole && <Dimension h={selHole} px={px} units={units} view={v} />}
        {corners?.map((c, i) => (
          <g key={i} data-corner={i + 1} className="cursor-move">
            <rect x={c.x - 6 * px} y={-c.y - 6 * px} width={12 * px} height={12 * px} fill={draggingCorner === i ? '#f2b544' : '#ffffff'} stroke="#10232d" strokeWidth={1.8 * px} />
            <text x={c.x + 9 * px} y={-c.y + 16 * px} fontSize={12 * px} fontWeight={700} fill="#10232d" stroke="#ffffff" strokeWidth={3 * px} paintOrder="stroke">{i + 1}</text>
          </g>
        ))}
        {draggingCorner !== null && corners?.[draggingCorner] && (
          <text x={v.x + 10 * px} y={v.y + 22 * px} fontSize={14 * px} fontWeight={700} fill="#10232d" stroke="#ffffff" strokeWidth={3 * px} paintOrder="stroke" data-testid="corner-readout">
            corner {draggingCorner + 1}: X {showLength(corners[draggingCorner]!.x, units)}  Y {showLength(corners[draggingCorner]!.y, units)}
          </text>
        )}
      </svg>
      <div className="absolute right-2 top-11 flex gap-1">
        <button type="button" className="rounded border border-blast-200 bg-white px-2 py-1 text-sm hover:bg-plate-100" onClick={() => setView(null)} title="Fit the plate in view">Fit</button>
      </div>
      {stale && (
        <p className="absolute inset-x-0 bottom-9 mx-auto w-fit rounded bg-finding-warning px-3 py-1 text-sm font-semibold text-white" role="status">
          Showing the last plate that could be laid out — fix the marked field to update it.
        </p>
      )}
      <div className="pointer-events-none absolute inset-x-0 bottom-0 flex flex-wrap items-center gap-x-4 gap-y-0.5 bg-white/90 px-2 py-1 text-[13px] text-plate-900" data-testid="legend">
        <LegendRow face="engine" />
        <LegendRow face="transmission" />
        <LegendRow face="plate" />
        <span className="flex items-center gap-1.5"><span className="inline-block h-1 w-5 rounded bg-finding-error" /> finding</span>
        <span className="text-xs text-plate-500">seen from the transmission side · +X right, +Y up · wheel zooms, drag pans</span>
      </div>
    </div>
  );
}

function LegendRow({ face }: { face: keyof typeof FACE_LOOK }) {
  const l = FACE_LOOK[face];
  return (
    <span className="flex items-center gap-1.5">
      <svg width="16" height="16" viewBox="-8 -8 16 16" aria-hidden="true">
        <circle r="5.5" fill={l.fill} stroke={l.stroke} strokeWidth="1.6" />
        {l.ring && <circle r="7.3" fill="none" stroke={l.stroke} strokeWidth="1" strokeDasharray="2 1.5" />}
      </svg>
      {l.label}
    </span>
  );
}

/** Same look: every field the mark draws (a new profile makes new hole objects on each edit). */
function sameMark(a: MarkProps, b: MarkProps): boolean {
  if (a.px !== b.px || a.hovered !== b.hovered || a.selected !== b.selected || a.flag !== b.flag || a.onHover !== b.onHover) return false;
  const g = a.h;
  const k = b.h;
  if (g === k) return true;
  return (
    g.id === k.id && g.face === k.face && g.operation === k.operation && g.center.x === k.center.x && g.center.y === k.center.y && g.diameterMm === k.diameterMm &&
    g.counterbore?.diameterMm === k.counterbore?.diameterMm
  );
}

interface MarkProps { h: ProfileHole; px: number; hovered: boolean; selected: boolean; flag?: keyof typeof SEV_COLOUR; onHover(id: string | null): void }

const HoleMark = memo(function HoleMark({ h, px, hovered, selected, flag, onHover }: { h: ProfileHole; px: number; hovered: boolean; selected: boolean; flag?: keyof typeof SEV_COLOUR; onHover(id: string | null): void }) {
  const look = FACE_LOOK[h.face];
  const r = h.diameterMm / 2;
  const hot = hovered || selected;
  return (
    <g data-feature={h.id} data-face={h.face} data-flag={flag} onPointerEnter={() => onHover(h.id)} onPointerLeave={() => onHover(null)} className="cursor-pointer">
      {h.counterbore && <circle cx={h.center.x} cy={-h.center.y} r={h.counterbore.diameterMm / 2} fill="none" stroke={look.stroke} strokeWidth={px} strokeDasharray={`${3 * px} ${2 * px}`} />}
      <circle cx={h.center.x} cy={-h.center.y} r={r} fill={hot ? '#f2b544' : look.fill} stroke={flag ? SEV_COLOUR[flag] : look.stroke} strokeWidth={(hot ? 3 : flag ? 2.4 : 1.6) * px} />
      {look.ring && <circle cx={h.center.x} cy={-h.center.y} r={r + 3 * px} fill="none" stroke={look.stroke} strokeWidth={px} strokeDasharray={look.ring.split(' ').map((n) => Number(n) * px).join(' ')} />}
      {h.operation === 'dowelReam' && (
        <g stroke={look.stroke} strokeWidth={px}>
          <line x1={h.center.x - r * 0.6} y1={-h.center.y} x2={h.center.x + r * 0.6} y2={-h.center.y} />
          <line x1={h.center.x} y1={-h.center.y - r * 0.6} x2={h.center.x} y2={-h.center.y + r * 0.6} />
        </g>
      )}
      <text x={h.center.x + r + 3 * px} y={-h.center.y - r - 1 * px} fontSize={(hot ? 15 : 12) * px} fontWeight={hot ? 700 : 600} fill={look.stroke} stroke="#ffffff" strokeWidth={3 * px} paintOrder="stroke">
        {h.id}
      </text>
    </g>
  );
}, sameMark);

function FindingMark({ f, px, active }: { f: Finding; px: number; active: boolean }) {
  const c = SEV_COLOUR[f.severity];
  const at = f.at!;
  const w = (active ? 5 : 3.2) * px;
  if ('from' in at) {
    return (
      <g data-finding={f.code} data-severity={f.severity} pointerEvents="none">
        <line x1={at.from.x} y1={-at.from.y} x2={at.to.x} y2={-at.to.y} stroke={c} strokeWidth={w} strokeLinecap="round" />
        <circle cx={at.from.x} cy={-at.from.y} r={3 * px} fill={c} />
        <circle cx={at.to.x} cy={-at.to.y} r={3 * px} fill={c} />
      </g>
    );
  }
  return (
    <g data-finding={f.code} data-severity={f.severity} pointerEvents="none">
      <circle cx={at.x} cy={-at.y} r={9 * px} fill="none" stroke={c} strokeWidth={w} />
      <line x1={at.x - 13 * px} y1={-at.y} x2={at.x + 13 * px} y2={-at.y} stroke={c} strokeWidth={px} />
    </g>
  );
}

/** The selected feature: diameter and position from the datum, as a machinist reads them. */
function Dimension({ h, px, units, view }: { h: ProfileHole; px: number; units: DisplayUnits; view: View }) {
  const { x, y } = h.center;
  const r = h.diameterMm / 2;
  const fs = 14 * px;
  const lines = [
    `${h.id}  ⌀${showLength(h.diameterMm, units)}${h.thread ? `  ${h.thread}` : ''}${h.fit ? `  ${h.fit.designation}` : ''}`,
    `X ${showLength(x, units)}   Y ${showLength(y, units)}`,
  ];
  if (h.counterbore) lines.push(`c'bore ⌀${showLength(h.counterbore.diameterMm, units)} × ${showLength(h.counterbore.depthMm, units)} ${h.counterbore.fromSide} side`);
  const boxW = fs * 0.62 * Math.max(...lines.map((l) => l.length)) + 8 * px;
  // the label goes to the side of the hole with room for it, and never above the view
  const right = x + r + 24 * px + boxW < view.x + view.w;
  // …and never off the left edge either
  const tx = right ? x + r + 24 * px : Math.max(x - r - 24 * px - boxW + 4 * px, view.x + 8 * px);
  const ty = Math.max(-y - r - 24 * px, view.y + fs * 1.6);
  return (
    <g data-testid="dimension" pointerEvents="none">
      <g stroke="#10232d" strokeWidth={0.9 * px} strokeDasharray={`${4 * px} ${3 * px}`} opacity={0.7}>
        <line x1={0} y1={-y} x2={x} y2={-y} />
        <line x1={x} y1={0} x2={x} y2={-y} />
      </g>
      <line x1={x + (right ? r : -r) * 0.7} y1={-y - r * 0.7} x2={right ? tx : tx + boxW - 8 * px} y2={ty + fs * 0.3} stroke="#10232d" strokeWidth={px} />
      <rect x={tx - 4 * px} y={ty - fs * 1.1} width={boxW} height={fs * 1.3 * lines.length + 6 * px} fill="#10232d" rx={3 * px} />
      {lines.map((l, i) => (
        <text key={i} x={tx} y={ty + i * fs * 1.3} fontSize={fs} fill="#ffffff" fontFamily="ui-monospace, monospace">
          {l}
        </text>
      ))}
    </g>
  );
}

export const EditorDrawing = memo(EditorDrawingInner);
