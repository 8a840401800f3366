import { useEffect, useMemo, useRef, useState, type PointerEvent } from 'react';
import { fromView, toView, type FaceView } from '../../domain/measure/pattern';

export interface FaceOverlayHole {
  id: string;
  centerU: number;
  centerV: number;
  diameterMm: number;
  flagged: boolean;
  inPattern: boolean;
}

export interface FaceOverlay {
  holes: FaceOverlayHole[];
  selectedId: string | null;
  boltCircle: { centerU: number; centerV: number; diameterMm: number } | null;
  axis: { u: number; v: number } | null;
}

type Tool = 'box' | 'lasso';

/**
 * The flattened face: points in face coordinates drawn in the builder's view (flip / turn), with
 * fitted holes, the bolt circle and the bore axis on top. Drag a box or a lasso to select; the
 * selection is handed back as a polygon in face coordinates.
 */
export function MeasurementFace({
  points,
  overlay,
  view,
  tool,
  onSelect,
  onPickHole,
}: {
  points: Float32Array | null;
  overlay: FaceOverlay;
  view: FaceView;
  tool: Tool;
  onSelect: (polygon: { u: number; v: number }[]) => void;
  onPickHole: (id: string) => void;
}) {
  const canvas = useRef<HTMLCanvasElement>(null);
  const [drag, setDrag] = useState<{ x: number; y: number }[] | null>(null);
  const size = 640;

  // view-space bounds → canvas transform (y up)
  const frame = useMemo(() => {
    if (!points || points.length < 2) return null;
    let minX = Infinity;
    let maxX = -Infinity;
    let minY = Infinity;
    let maxY = -Infinity;
    for (let i = 0; i < points.length; i += 2) {
      const p = toView(view, points[i]!, points[i + 1]!);
      if (p.x < minX) minX = p.x;
      if (p.x > maxX) maxX = p.x;
      if (p.y < minY) minY = p.y;
      if (p.y > maxY) maxY = p.y;
    }
    const span = Math.max(maxX - minX, maxY - minY, 1e-6);
    const scale = (size * 0.92) / span;
    const cx = (minX + maxX) / 2;
    const cy = (minY + maxY) / 2;
    return {
      scale,
      toPx: (x: number, y: number) => [size / 2 + (x - cx) * scale, size / 2 - (y - cy) * scale] as const,
      fromPx: (px: number, py: number) => ({ x: cx + (px - size / 2) / scale, y: cy - (py - size / 2) / scale }),
    };
  }, [points, view]);

  useEffect(() => {
    const ctx = canvas.current?.getContext('2d');
    if (!ctx) return;
    ctx.clearRect(0, 0, size, size);
    ctx.fillStyle = '#ffffff';
    ctx.fillRect(0, 0, size, size);
    if (!points || !frame) return;
    ctx.fillStyle = 'rgba(47, 90, 112, 0.55)';
    for (let i = 0; i < points.length; i += 2) {
      const p = toView(view, points[i]!, points[i + 1]!);
      const [x, y] = frame.toPx(p.x, p.y);
      ctx.fillRect(x, y, 1.2, 1.2);
    }
    const { boltCircle, axis } = overlay;
    if (boltCircle) {
      const c = toView(view, boltCircle.centerU, boltCircle.centerV);
      const [x, y] = frame.toPx(c.x, c.y);
      ctx.setLineDash([6, 5]);
      ctx.strokeStyle = '#b9811a';
      ctx.lineWidth = 1.5;
      ctx.beginPath();
      ctx.arc(x, y, (boltCircle.diameterMm / 2) * frame.scale, 0, 2 * Math.PI);
      ctx.stroke();
      ctx.setLineDash([]);
      ctx.beginPath();
      ctx.moveTo(x - 7, y - 7);
      ctx.lineTo(x + 7, y + 7);
      ctx.moveTo(x - 7, y + 7);
      ctx.lineTo(x + 7, y - 7);
      ctx.stroke();
    }
    if (axis) {
      const a = toView(view, axis.u, axis.v);
      const [x, y] = frame.toPx(a.x, a.y);
      ctx.strokeStyle = '#1d3a4a';
      ctx.lineWidth = 1.5;
      ctx.beginPath();
      ctx.moveTo(x - 10, y);
      ctx.lineTo(x + 10, y);
      ctx.moveTo(x, y - 10);
      ctx.lineTo(x, y + 10);
      ctx.stroke();
    }
    ctx.font = '600 13px "Source Sans 3", sans-serif';
    for (const h of overlay.holes) {
      const c = toView(view, h.centerU, h.centerV);
      const [x, y] = frame.toPx(c.x, c.y);
      const r = Math.max(3, (h.diameterMm / 2) * frame.scale);
      const selected = h.id === overlay.selectedId;
      ctx.lineWidth = selected ? 3 : 2;
      ctx.strokeStyle = selected ? '#b9811a' : h.flagged ? '#c98a00' : h.inPattern ? '#1d3a4a' : '#4f8199';
      ctx.fillStyle = selected ? 'rgba(242, 181, 68, 0.25)' : h.flagged ? 'rgba(201, 138, 0, 0.15)' : 'rgba(143, 183, 201, 0.2)';
      ctx.beginPath();
      ctx.arc(x, y, r, 0, 2 * Math.PI);
      ctx.fill();
      ctx.stroke();
      ctx.fillStyle = '#10232d';
      ctx.strokeStyle = '#ffffff';
      ctx.lineWidth = 3;
      ctx.strokeText(h.id, x + r + 3, y - r - 2);
      ctx.fillText(h.id, x + r + 3, y - r - 2);
    }
    if (drag && drag.length > 1) {
      ctx.strokeStyle = '#b9811a';
      ctx.fillStyle = 'rgba(242, 181, 68, 0.12)';
      ctx.lineWidth = 1.5;
      ctx.beginPath();
      const poly = tool === 'box' ? boxCorners(drag[0]!, drag[drag.length - 1]!) : drag;
      poly.forEach((p, i) => (i === 0 ? ctx.moveTo(p.x, p.y) : ctx.lineTo(p.x, p.y)));
      ctx.closePath();
      ctx.fill();
      ctx.stroke();
    }
  }, [points, frame, overlay, view, drag, tool]);

  const local = (e: PointerEvent<HTMLCanvasElement>) => {
    const r = e.currentTarget.getBoundingClientRect();
    return { x: ((e.clientX - r.left) / r.width) * size, y: ((e.clientY - r.top) / r.height) * size };
  };
  const finish = () => {
    if (!drag || !frame) return setDrag(null);
    const poly = tool === 'box' ? boxCorners(drag[0]!, drag[drag.length - 1]!) : drag;
    setDrag(null);
    const first = drag[0]!;
    const last = drag[drag.length - 1]!;
    if (Math.hypot(last.x - first.x, last.y - first.y) < 4 && drag.length < 4) {
      // a click: pick the hole under it
      const p = frame.fromPx(first.x, first.y);
      const hit = overlay.holes.find((h) => {
        const c = toView(view, h.centerU, h.centerV);
        return Math.hypot(c.x - p.x, c.y - p.y) <= Math.max(h.diameterMm / 2, 4 / frame.scale);
      });
      if (hit) onPickHole(hit.id);
      return;
    }
    onSelect(
      poly.map((q) => {
        const v = frame.fromPx(q.x, q.y);
        return fromView(view, v.x, v.y);
      }),
    );
  };

  return (
    <canvas
      ref={canvas}
      width={size}
      height={size}
      data-testid="face-view"
      aria-label="Flattened face: drag to select points around a hole or bore"
      className="w-full max-w-[640px] cursor-crosshair touch-none rounded border border-blast-200 bg-white"
      onPointerDown={(e) => {
        e.currentTarget.setPointerCapture(e.pointerId);
        setDrag([local(e)]);
      }}
      onPointerMove={(e) => {
        if (!drag) return;
        const p = local(e);
        setDrag(tool === 'box' ? [drag[0]!, p] : [...drag, p]);
      }}
      onPointerUp={finish}
    />
  );
}

function boxCorners(a: { x: number; y: number }, b: { x: number; y: number }) {
  return [
    { x: a.x, y: a.y },
    { x: b.x, y: a.y },
    { x: b.x, y: b.y },
    { x: a.x, y: b.y },
  ];
}
