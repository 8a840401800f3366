import { useEffect, useMemo, useRef, useState } from 'react';
import {
  AmbientLight,
  BufferAttribute,
  BufferGeometry,
  DirectionalLight,
  DoubleSide,
  ExtrudeGeometry,
  Group,
  LineBasicMaterial,
  LineSegments,
  Mesh,
  MeshStandardMaterial,
  Path,
  PerspectiveCamera,
  Scene,
  Shape,
  ShapeGeometry,
  WebGLRenderer,
  type Object3D,
} from 'three';
import { OrbitControls } from 'three/examples/jsm/controls/OrbitControls.js';
import type { OutlineSegment, PlateProfile } from '~/domain';
import { getKernel, progressFraction, type KernelProgress } from '~/cad/kernelClient';
import type { PlateMesh } from '~/cad/mesh';

/** Where the time of one 3D update went (ms): kernel build and mesh in the worker, the round trip, the geometry here. */
interface BuildTiming {
  readonly kernelMs: number;
  readonly meshMs: number;
  readonly roundTripMs: number;
  readonly geometryMs: number;
}

function addChain(path: Path, chain: readonly OutlineSegment[]): void {
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
export function plateGeometry(profile: PlateProfile): { solid: ExtrudeGeometry; cap: ShapeGeometry; rims: { engine: Float32Array; transmission: Float32Array; plate: Float32Array } } {
  const shape = new Shape();
  addChain(shape, profile.outline);
  for (const h of profile.holes) {
    const p = new Path();
    p.absarc(h.center.x, h.center.y, h.diameterMm / 2, 0, Math.PI * 2, true);
    shape.holes.push(p);
  }
  const solid = new ExtrudeGeometry(shape, { depth: profile.thicknessMm, bevelEnabled: false, curveSegments: 24 });
  const cap = new ShapeGeometry(shape, 24);
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
export function kernelGeometry(mesh: PlateMesh, thicknessMm: number): { geometry: BufferGeometry; edges: Float32Array } {
  const g = new BufferGeometry();
  g.setAttribute('position', new BufferAttribute(mesh.positions, 3));
  g.setAttribute('normal', new BufferAttribute(mesh.normals, 3));
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
  g.setIndex(new BufferAttribute(all, 1));
  return { geometry: g, edges: mesh.edges };
}

type KernelState =
  | { readonly kind: 'loading'; readonly progress: KernelProgress | null }
  | { readonly kind: 'ready'; readonly profile: PlateProfile; readonly geometry: BufferGeometry; readonly edges: Float32Array; readonly buildMs: number }
  | { readonly kind: 'failed'; readonly message: string };

/**
 * 3D view: orbit with the left button, zoom with the wheel. The kernel's display mesh from the
 * worker (verified solid), rebuilt as soon as the worker is free after an edit (only the newest
 * edit is built) with a "rebuilding…" badge; the first
 * use shows the kernel download. Engine side in steel blue, transmission side in brass. Until the
 * kernel is ready (or when it cannot build the plate) the plate is shown from its 2D profile.
 */
export default function Plate3D({ profile }: { profile: PlateProfile | null }) {
  const [kernel, setKernel] = useState<KernelState>({ kind: 'loading', progress: null });
  const [timing, setTiming] = useState<BuildTiming | null>(null);
  // Builds start at once, without a pause: while one runs in the worker, newer edits wait, and
  // only the newest of them is built when it is done (typing never queues a build per key).
  const latest = useRef<PlateProfile | null>(profile);
  latest.current = profile;
  const running = useRef(false);
  const alive = useRef(true);
  useEffect(() => {
    alive.current = true;
    return () => {
      alive.current = false;
    };
  }, []);
  useEffect(() => {
    if (!profile || running.current) return;
    running.current = true;
    void (async () => {
      try {
        const k = await getKernel((p) => alive.current && setKernel((s) => (s.kind === 'ready' ? s : { kind: 'loading', progress: p })));
        for (;;) {
          const want = latest.current;
          if (!want || !alive.current) break;
          const sent = performance.now();
          const r = await k.build(want);
          const back = performance.now();
          if (!alive.current) break;
          if (!r.ok) setKernel({ kind: 'failed', message: r.message });
          else {
            const { geometry, edges } = kernelGeometry(r.mesh, want.thicknessMm);
            const done = performance.now();
            setKernel({ kind: 'ready', profile: want, geometry, edges, buildMs: r.buildMs + r.meshMs });
            setTiming({ kernelMs: r.buildMs, meshMs: r.meshMs, roundTripMs: back - sent, geometryMs: done - back });
          }
          if (latest.current === want) break;
        }
      } catch (e) {
        if (alive.current) setKernel({ kind: 'failed', message: e instanceof Error ? e.message : String(e) });
      } finally {
        running.current = false;
      }
    })();
  }, [profile]);
  const fallback = useMemo(() => (kernel.kind !== 'ready' && profile ? plateGeometry(profile) : null), [kernel.kind, profile]);
  useEffect(() => () => {
    fallback?.solid.dispose();
    fallback?.cap.dispose();
  }, [fallback]);
  useEffect(() => () => (kernel.kind === 'ready' ? kernel.geometry.dispose() : undefined), [kernel]);

  // the three.js view, made once; a frame is drawn only when the content or the camera changes
  const host = useRef<HTMLDivElement>(null);
  const stage = useRef<Stage | null>(null);
  const [noWebGl, setNoWebGl] = useState<string | null>(null);
  useEffect(() => {
    const el = host.current;
    if (!el) return;
    try {
      stage.current = makeStage(el);
    } catch (e) {
      setNoWebGl(e instanceof Error ? e.message : String(e));
    }
    return () => {
      stage.current?.dispose();
      stage.current = null;
    };
  }, []);

  const shown = kernel.kind === 'ready' ? kernel.profile : profile;
  useEffect(() => {
    const st = stage.current;
    if (!st || !shown) return;
    const objects: Object3D[] = [];
    const owned: { dispose(): void }[] = [];
    const lines = (data: Float32Array, colour: string) => {
      const g = new BufferGeometry();
      g.setAttribute('position', new BufferAttribute(data, 3));
      const m = new LineBasicMaterial({ color: colour });
      owned.push(g, m);
      objects.push(new LineSegments(g, m));
    };
    if (kernel.kind === 'ready') {
      objects.push(new Mesh(kernel.geometry, st.materials.kernel));
      lines(kernel.edges, '#1d3a4a');
    } else if (fallback) {
      objects.push(new Mesh(fallback.solid, st.materials.fallback));
      const top = new Mesh(fallback.cap, st.materials.transmissionCap);
      top.position.z = shown.thicknessMm + 0.02;
      const bottom = new Mesh(fallback.cap, st.materials.engineCap);
      bottom.position.z = -0.02;
      objects.push(top, bottom);
      lines(fallback.rims.engine, '#1d3a4a');
      lines(fallback.rims.transmission, '#9a6a10');
      lines(fallback.rims.plate, '#4f8199');
    }
    st.show(objects, shown);
    return () => {
      st.show([], null);
      owned.forEach((o) => o.dispose());
    };
  }, [kernel, fallback, shown]);

  if (!shown) return <p className="p-6 text-finding-error">Nothing to show: the plate cannot be laid out.</p>;
  const pending = kernel.kind === 'ready' && kernel.profile !== profile;
  return (
    <div className="relative h-full w-full bg-gradient-to-b from-blast-50 to-blast-200" data-testid="plate-3d" data-source={kernel.kind === 'ready' ? 'kernel' : 'profile'}
      data-kernel-ms={timing?.kernelMs.toFixed(1)} data-mesh-ms={timing?.meshMs.toFixed(1)} data-round-trip-ms={timing?.roundTripMs.toFixed(1)} data-geometry-ms={timing?.geometryMs.toFixed(1)}>
      <div ref={host} className="absolute inset-0" />
      {noWebGl && <p className="absolute inset-x-4 top-12 rounded bg-white/95 p-3 text-sm" role="alert">The 3D view needs WebGL, which this browser does not offer ({noWebGl}). The drawing and every export still work.</p>}
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

interface Stage {
  readonly materials: { readonly kernel: MeshStandardMaterial[]; readonly fallback: MeshStandardMaterial[]; readonly transmissionCap: MeshStandardMaterial; readonly engineCap: MeshStandardMaterial };
  /** replaces the shown objects; the camera is placed for the first plate shown */
  show(objects: readonly Object3D[], profile: PlateProfile | null): void;
  dispose(): void;
}

/**
 * Renderer, camera, lights and orbit controls in `el`, rendering on demand (a frame when the
 * content, the size or the camera changes; none while the builder types). Engine side (z = 0)
 * steel blue, transmission side (z = thickness) brass, walls grey.
 */
function makeStage(el: HTMLElement): Stage {
  const renderer = new WebGLRenderer({ antialias: true, alpha: true });
  renderer.setPixelRatio(Math.min(window.devicePixelRatio || 1, 2));
  el.appendChild(renderer.domElement);
  renderer.domElement.style.display = 'block';
  const scene = new Scene();
  const camera = new PerspectiveCamera(40, 1, 1, 10_000);
  camera.up.set(0, 0, 1);
  const ambient = new AmbientLight(0xffffff, 0.6);
  const key = new DirectionalLight(0xffffff, 1.6);
  const fill = new DirectionalLight(0xffffff, 0.5);
  scene.add(ambient, key, fill);
  const content = new Group();
  scene.add(content);
  const std = (color: string, metalness: number, roughness: number, doubleSide = false) => new MeshStandardMaterial({ color, metalness, roughness, ...(doubleSide ? { side: DoubleSide } : {}) });
  const materials = {
    kernel: [std('#9db7c6', 0.25, 0.5), std('#e8d7b0', 0.25, 0.5), std('#b9c6cc', 0.35, 0.45)],
    fallback: [std('#b9c6cc', 0.35, 0.45), std('#9fb1ba', 0.35, 0.55)],
    transmissionCap: std('#e8d7b0', 0.25, 0.5, true),
    engineCap: std('#9db7c6', 0.25, 0.5, true),
  };
  let frame = 0;
  const render = () => {
    if (frame) return;
    frame = requestAnimationFrame(() => {
      frame = 0;
      renderer.render(scene, camera);
    });
  };
  const controls = new OrbitControls(camera, renderer.domElement);
  controls.addEventListener('change', render);
  const resize = () => {
    const w = Math.max(1, el.clientWidth);
    const h = Math.max(1, el.clientHeight);
    renderer.setSize(w, h, false);
    renderer.domElement.style.width = '100%';
    renderer.domElement.style.height = '100%';
    camera.aspect = w / h;
    camera.updateProjectionMatrix();
    render();
  };
  const ro = new ResizeObserver(resize);
  ro.observe(el);
  resize();
  let placed = false;
  return {
    materials,
    show(objects, profile) {
      content.clear();
      if (objects.length) content.add(...objects);
      if (profile && !placed) {
        placed = true;
        const b = profile.bbox;
        const size = Math.max(b.maxX - b.minX, b.maxY - b.minY);
        camera.position.set(size * 0.35, -size * 0.9, size * 0.9);
        camera.far = size * 20;
        camera.updateProjectionMatrix();
        key.position.set(size, -size, size * 2);
        fill.position.set(-size, size, -size);
        controls.target.set(0, 0, 0);
        controls.update();
      }
      render();
    },
    dispose() {
      cancelAnimationFrame(frame);
      ro.disconnect();
      controls.removeEventListener('change', render);
      controls.dispose();
      Object.values(materials).flat().forEach((m) => m.dispose());
      renderer.dispose();
      renderer.domElement.remove();
    },
  };
}
