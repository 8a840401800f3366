import { useEffect, useMemo, useState } from 'react';
import { Canvas, useThree } from '@react-three/fiber';
import * as THREE from 'three';
import { OrbitControls } from 'three/examples/jsm/controls/OrbitControls.js';
import type { OutlineSegment, PlateProfile } from '~/domain';

/** Rebuild this long after the last edit, so typing is never held up by the 3D view. */
export const REBUILD_DEBOUNCE_MS = 250;

function addChain(path: THREE.Path, chain: readonly OutlineSegment[]): void {
  chain.forEach((s, i) => {
    if (i === 0) path.moveTo(s.start.x, s.start.y);
    if (s.kind === 'line') path.lineTo(s.end.x, s.end.y);
    else {
      const a0 = Math.atan2(s.start.y - s.center.y, s.start.x - s.center.x);
      const a1 = Math.atan2(s.end.y - s.center.y, s.end.x - s.center.x);
      path.absarc(s.center.x, s.center.y, s.radiusMm, a0, a1, !s.ccw);
    }
  });
}

/** The plate as a solid from its 2D profile: outline extruded, every round feature cut through. */
export function plateGeometry(profile: PlateProfile): { solid: THREE.ExtrudeGeometry; cap: THREE.ShapeGeometry; rims: { engine: Float32Array; transmission: Float32Array; plate: Float32Array } } {
  const shape = new THREE.Shape();
  addChain(shape, profile.outline);
  for (const h of profile.holes) {
    const p = new THREE.Path();
    p.absarc(h.center.x, h.center.y, h.diameterMm / 2, 0, Math.PI * 2, true);
    shape.holes.push(p);
  }
  const solid = new THREE.ExtrudeGeometry(shape, { depth: profile.thicknessMm, bevelEnabled: false, curveSegments: 24 });
  const cap = new THREE.ShapeGeometry(shape, 24);
  const rim = (face: string, z: number) => {
    const pts: number[] = [];
    for (const h of profile.holes.filter((x) => x.face === face)) {
      const r = (h.counterbore?.diameterMm ?? h.diameterMm) / 2;
      for (let k = 0; k < 32; k++) {
        const a = (k / 32) * Math.PI * 2;
        const b = ((k + 1) / 32) * Math.PI * 2;
        pts.push(h.center.x + r * Math.cos(a), h.center.y + r * Math.sin(a), z, h.center.x + r * Math.cos(b), h.center.y + r * Math.sin(b), z);
      }
    }
    return new Float32Array(pts);
  };
  return { solid, cap, rims: { engine: rim('engine', -0.05), transmission: rim('transmission', profile.thicknessMm + 0.05), plate: rim('plate', profile.thicknessMm + 0.05) } };
}

function Controls() {
  const { camera, gl, invalidate } = useThree();
  useEffect(() => {
    // render on demand: a frame when the view moves, none while the builder types
    const c = new OrbitControls(camera, gl.domElement);
    const onChange = () => invalidate();
    c.addEventListener('change', onChange);
    return () => {
      c.removeEventListener('change', onChange);
      c.dispose();
    };
  }, [camera, gl, invalidate]);
  return null;
}

function Lines({ data, colour }: { data: Float32Array; colour: string }) {
  const geo = useMemo(() => {
    const g = new THREE.BufferGeometry();
    g.setAttribute('position', new THREE.BufferAttribute(data, 3));
    return g;
  }, [data]);
  useEffect(() => () => geo.dispose(), [geo]);
  return (
    <lineSegments geometry={geo}>
      <lineBasicMaterial color={colour} />
    </lineSegments>
  );
}

/**
 * 3D view: orbit with the left button, zoom with the wheel. Engine side (z = 0) in steel blue with
 * ink rims, transmission side (z = thickness) in brass with brass rims. Built from the 2D profile,
 * debounced after edits; a badge says when it is catching up.
 */
export default function Plate3D({ profile }: { profile: PlateProfile | null }) {
  const [shown, setShown] = useState<PlateProfile | null>(profile);
  const pending = profile !== shown;
  useEffect(() => {
    const t = setTimeout(() => setShown(profile), REBUILD_DEBOUNCE_MS);
    return () => clearTimeout(t);
  }, [profile]);
  const built = useMemo(() => (shown ? plateGeometry(shown) : null), [shown]);
  useEffect(() => () => {
    built?.solid.dispose();
    built?.cap.dispose();
  }, [built]);
  if (!shown || !built) return <p className="p-6 text-finding-error">Nothing to show: the plate cannot be laid out.</p>;
  const b = shown.bbox;
  const size = Math.max(b.maxX - b.minX, b.maxY - b.minY);
  const t = shown.thicknessMm;
  return (
    <div className="relative h-full w-full bg-gradient-to-b from-blast-50 to-blast-200" data-testid="plate-3d">
      <Canvas frameloop="demand" camera={{ position: [size * 0.35, -size * 0.9, size * 0.9], fov: 40, near: 1, far: size * 20, up: [0, 0, 1] }} dpr={[1, 2]}>
        <ambientLight intensity={0.6} />
        <directionalLight position={[size, -size, size * 2]} intensity={1.6} />
        <directionalLight position={[-size, size, -size]} intensity={0.5} />
        <mesh geometry={built.solid}>
          <meshStandardMaterial attach="material-0" color="#b9c6cc" metalness={0.35} roughness={0.45} />
          <meshStandardMaterial attach="material-1" color="#9fb1ba" metalness={0.35} roughness={0.55} />
        </mesh>
        <mesh geometry={built.cap} position={[0, 0, t + 0.02]}>
          <meshStandardMaterial color="#e8d7b0" metalness={0.25} roughness={0.5} side={THREE.DoubleSide} />
        </mesh>
        <mesh geometry={built.cap} position={[0, 0, -0.02]}>
          <meshStandardMaterial color="#9db7c6" metalness={0.25} roughness={0.5} side={THREE.DoubleSide} />
        </mesh>
        <Lines data={built.rims.engine} colour="#1d3a4a" />
        <Lines data={built.rims.transmission} colour="#9a6a10" />
        <Lines data={built.rims.plate} colour="#4f8199" />
        <Controls />
      </Canvas>
      <div className="pointer-events-none absolute bottom-0 inset-x-0 flex flex-wrap gap-x-4 bg-white/90 px-2 py-1 text-[13px]">
        <span><span className="mr-1 inline-block h-3 w-3 rounded-sm bg-[#e8d7b0] ring-1 ring-brass-700" />transmission side (up)</span>
        <span><span className="mr-1 inline-block h-3 w-3 rounded-sm bg-[#9db7c6] ring-1 ring-plate-900" />engine side</span>
        <span className="text-xs text-plate-500">built from the 2D profile · drag to orbit, wheel to zoom</span>
      </div>
      {pending && <span className="absolute left-2 top-2 rounded bg-plate-900 px-2 py-0.5 text-xs font-semibold text-white" role="status">rebuilding…</span>}
    </div>
  );
}
