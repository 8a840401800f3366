import { useEffect, useMemo, useState } from 'react';
import { Canvas, useThree } from '@react-three/fiber';
import * as THREE from 'three';
import { OrbitControls } from 'three/examples/jsm/controls/OrbitControls.js';
import type { OutlineSegment, PlateProfile } from '~/domain';
import { getKernel, progressFraction, type KernelProgress } from '~/cad/kernelClient';
import type { PlateMesh } from '~/cad/mesh';

/** Rebuild this long after the last edit, so typing is never held up by the 3D view. */
export const REBUILD_DEBOUNCE_MS = 150;

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

/** The kernel's display mesh as one geometry with three groups: engine side, transmission side, walls. */
export function kernelGeometry(mesh: PlateMesh, thicknessMm: number): { geometry: THREE.BufferGeometry; edges: Float32Array } {
  const g = new THREE.BufferGeometry();
  g.setAttribute('position', new THREE.BufferAttribute(mesh.positions, 3));
  g.setAttribute('normal', new THREE.BufferAttribute(mesh.normals, 3));
  const groups: number[][] = [[], [], []];
  const idx = mesh.indices;
  for (let t = 0; t < idx.length; t += 3) {
    const a = idx[t]!;
    const b = idx[t + 1]!;
    const c = idx[t + 2]!;
    const nz = mesh.normals[a * 3 + 2]!;
    const z = (mesh.positions[a * 3 + 2]! + mesh.positions[b * 3 + 2]! + mesh.positions[c * 3 + 2]!) / 3;
    // flat faces at z = 0 looking forward are the engine side, at z = thickness the transmission side
    const which = nz < -0.99 && z < thicknessMm / 2 ? 0 : nz > 0.99 && z > thicknessMm / 2 ? 1 : 2;
    groups[which]!.push(a, b, c);
  }
  const all = new Uint32Array(idx.length);
  let at = 0;
  groups.forEach((gr, i) => {
    all.set(gr, at);
    g.addGroup(at, gr.length, i);
    at += gr.length;
  });
  g.setIndex(new THREE.BufferAttribute(all, 1));
  return { geometry: g, edges: mesh.edges };
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
type KernelState =
  | { readonly kind: 'loading'; readonly progress: KernelProgress | null }
  | { readonly kind: 'ready'; readonly profile: PlateProfile; readonly geometry: THREE.BufferGeometry; readonly edges: Float32Array; readonly buildMs: number }
  | { readonly kind: 'failed'; readonly message: string };

/**
 * 3D view: orbit with the left button, zoom with the wheel. The kernel's display mesh from the
 * worker (verified solid), rebuilt after a pause in typing with a "rebuilding…" badge; the first
 * use shows the kernel download. Engine side in steel blue, transmission side in brass. Until the
 * kernel is ready (or when it cannot build the plate) the plate is shown from its 2D profile.
 */
export default function Plate3D({ profile }: { profile: PlateProfile | null }) {
  const [wanted, setWanted] = useState<PlateProfile | null>(profile);
  const [kernel, setKernel] = useState<KernelState>({ kind: 'loading', progress: null });
  useEffect(() => {
    const t = setTimeout(() => setWanted(profile), REBUILD_DEBOUNCE_MS);
    return () => clearTimeout(t);
  }, [profile]);
  useEffect(() => {
    if (!wanted) return;
    let live = true;
    void (async () => {
      try {
        const k = await getKernel((p) => live && setKernel((s) => (s.kind === 'ready' ? s : { kind: 'loading', progress: p })));
        const r = await k.build(wanted);
        if (!live) return;
        if (!r.ok) return setKernel({ kind: 'failed', message: r.message });
        const { geometry, edges } = kernelGeometry(r.mesh, wanted.thicknessMm);
        setKernel({ kind: 'ready', profile: wanted, geometry, edges, buildMs: r.buildMs + r.meshMs });
      } catch (e) {
        if (live) setKernel({ kind: 'failed', message: e instanceof Error ? e.message : String(e) });
      }
    })();
    return () => {
      live = false;
    };
  }, [wanted]);
  const fallback = useMemo(() => (kernel.kind !== 'ready' && wanted ? plateGeometry(wanted) : null), [kernel.kind, wanted]);
  useEffect(() => () => {
    fallback?.solid.dispose();
    fallback?.cap.dispose();
  }, [fallback]);
  useEffect(() => () => (kernel.kind === 'ready' ? kernel.geometry.dispose() : undefined), [kernel]);
  const shown = kernel.kind === 'ready' ? kernel.profile : wanted;
  if (!shown) return <p className="p-6 text-finding-error">Nothing to show: the plate cannot be laid out.</p>;
  const pending = kernel.kind === 'ready' && kernel.profile !== profile;
  const b = shown.bbox;
  const size = Math.max(b.maxX - b.minX, b.maxY - b.minY);
  const t = shown.thicknessMm;
  return (
    <div className="relative h-full w-full bg-gradient-to-b from-blast-50 to-blast-200" data-testid="plate-3d" data-source={kernel.kind === 'ready' ? 'kernel' : 'profile'}>
      <Canvas frameloop="demand" camera={{ position: [size * 0.35, -size * 0.9, size * 0.9], fov: 40, near: 1, far: size * 20, up: [0, 0, 1] }} dpr={[1, 2]}>
        <ambientLight intensity={0.6} />
        <directionalLight position={[size, -size, size * 2]} intensity={1.6} />
        <directionalLight position={[-size, size, -size]} intensity={0.5} />
        {kernel.kind === 'ready' ? (
          <>
            <mesh geometry={kernel.geometry}>
              <meshStandardMaterial attach="material-0" color="#9db7c6" metalness={0.25} roughness={0.5} />
              <meshStandardMaterial attach="material-1" color="#e8d7b0" metalness={0.25} roughness={0.5} />
              <meshStandardMaterial attach="material-2" color="#b9c6cc" metalness={0.35} roughness={0.45} />
            </mesh>
            <Lines data={kernel.edges} colour="#1d3a4a" />
          </>
        ) : fallback ? (
          <>
            <mesh geometry={fallback.solid}>
              <meshStandardMaterial attach="material-0" color="#b9c6cc" metalness={0.35} roughness={0.45} />
              <meshStandardMaterial attach="material-1" color="#9fb1ba" metalness={0.35} roughness={0.55} />
            </mesh>
            <mesh geometry={fallback.cap} position={[0, 0, t + 0.02]}>
              <meshStandardMaterial color="#e8d7b0" metalness={0.25} roughness={0.5} side={THREE.DoubleSide} />
            </mesh>
            <mesh geometry={fallback.cap} position={[0, 0, -0.02]}>
              <meshStandardMaterial color="#9db7c6" metalness={0.25} roughness={0.5} side={THREE.DoubleSide} />
            </mesh>
            <Lines data={fallback.rims.engine} colour="#1d3a4a" />
            <Lines data={fallback.rims.transmission} colour="#9a6a10" />
            <Lines data={fallback.rims.plate} colour="#4f8199" />
          </>
        ) : null}
        <Controls />
      </Canvas>
      <div className="pointer-events-none absolute bottom-0 inset-x-0 flex flex-wrap gap-x-4 bg-white/90 px-2 py-1 text-[13px]">
        <span><span className="mr-1 inline-block h-3 w-3 rounded-sm bg-[#e8d7b0] ring-1 ring-brass-700" />transmission side (up)</span>
        <span><span className="mr-1 inline-block h-3 w-3 rounded-sm bg-[#9db7c6] ring-1 ring-plate-900" />engine side</span>
        <span className="text-xs text-plate-500">
          {kernel.kind === 'ready' ? `CAD kernel solid, built in ${kernel.buildMs.toFixed(0)} ms` : 'preview from the 2D profile'} · drag to orbit, wheel to zoom
        </span>
      </div>
      {kernel.kind === 'loading' && (
        <div className="absolute left-2 top-2 w-72 rounded bg-white/95 p-2 text-sm shadow" role="status" data-testid="kernel-progress">
          <p className="font-semibold">{kernel.progress?.phase === 'starting' ? 'Starting the CAD kernel…' : 'Loading the CAD kernel (first use)…'}</p>
          <div className="mt-1 h-2 overflow-hidden rounded bg-blast-200"><div className="h-full bg-plate-700 transition-all" style={{ width: `${Math.round(progressFraction(kernel.progress) * 100)}%` }} /></div>
        </div>
      )}
      {kernel.kind === 'failed' && <p className="absolute left-2 top-2 max-w-md rounded bg-finding-error px-2 py-1 text-sm font-semibold text-white" role="alert">{kernel.message}</p>}
      {kernel.kind === 'ready' && pending && <span className="absolute left-2 top-2 rounded bg-plate-900 px-2 py-0.5 text-xs font-semibold text-white" role="status" data-testid="rebuilding">rebuilding…</span>}
    </div>
  );
}
