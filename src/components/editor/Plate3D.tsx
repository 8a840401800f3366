import { useEffect, useRef, useState } from 'react';
import {
  AmbientLight,
  BufferAttribute,
  BufferGeometry,
  DirectionalLight,
  Group,
  LineBasicMaterial,
  LineSegments,
  Mesh,
  MeshStandardMaterial,
  PerspectiveCamera,
  Scene,
  WebGLRenderer,
  type Object3D,
  OrbitControls,
} from '../three/kit';
import type { PlateProfile } from '~/domain';
import { buildForDisplay, getKernel, progressFraction, type KernelProgress } from '~/cad/kernelClient';
import type { PlateMesh } from '~/cad/mesh';

/** Where the time of one 3D update went (ms): kernel build and mesh in the worker, the round trip, the geometry here. */
interface BuildTiming {
  readonly kernelMs: number;
  readonly meshMs: number;
  /** the longer of the two workers' jobs when the mesh was made beside the verification, else their sum */
  readonly criticalMs: number;
  readonly parallel: boolean;
  /** how many updates have been shown (tests wait for the next one) */
  readonly updates: number;
  readonly roundTripMs: number;
  readonly geometryMs: number;
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

/** A verified solid's mesh ready for three.js. */
interface Shown {
  readonly profile: PlateProfile;
  readonly geometry: BufferGeometry;
  readonly edges: Float32Array;
  readonly buildMs: number;
}

type KernelState =
  | { readonly kind: 'loading'; readonly progress: KernelProgress | null }
  | ({ readonly kind: 'ready' } & Shown)
  /** the newest edit could not be built: the last verified solid (if any) stays on screen, marked */
  | { readonly kind: 'failed'; readonly message: string; readonly last: Shown | null };

function lastShown(s: KernelState): Shown | null {
  return s.kind === 'ready' ? s : s.kind === 'failed' ? s.last : null;
}

/**
 * 3D view: orbit with the left button, zoom with the wheel. The kernel's display mesh of the
 * verified solid (kernelClient.buildForDisplay), rebuilt as soon as the kernel is free after an
 * edit (only the newest edit is built) with a "rebuilding…" badge; the first use shows the kernel
 * download. Engine side in steel blue, transmission side in brass. Nothing but a verified solid
 * is shown: an edit the kernel cannot build keeps the last verified solid on screen under the
 * reason, marked as not the current plate.
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
    const fail = (message: string) => setKernel((s) => ({ kind: 'failed', message, last: lastShown(s) }));
    void (async () => {
      try {
        await getKernel((p) => alive.current && setKernel((s) => (s.kind === 'loading' ? { kind: 'loading', progress: p } : s)));
        for (;;) {
          const want = latest.current;
          if (!want || !alive.current) break;
          const sent = performance.now();
          const { result: r, meshedBeside, kernelCriticalMs } = await buildForDisplay(want);
          const back = performance.now();
          if (!alive.current) break;
          if (!r.ok) fail(r.message);
          else {
            const { geometry, edges } = kernelGeometry(r.mesh, want.thicknessMm);
            const done = performance.now();
            setKernel({ kind: 'ready', profile: want, geometry, edges, buildMs: kernelCriticalMs });
            setTiming((t) => ({ kernelMs: r.buildMs, meshMs: r.meshMs, criticalMs: kernelCriticalMs, parallel: meshedBeside, roundTripMs: back - sent, geometryMs: done - back, updates: (t?.updates ?? 0) + 1 }));
          }
          if (latest.current === want) break;
        }
      } catch (e) {
        if (alive.current) fail(e instanceof Error ? e.message : String(e));
      } finally {
        running.current = false;
      }
    })();
  }, [profile]);
  const view = lastShown(kernel);
  const geometry = view?.geometry ?? null;
  useEffect(() => () => geometry?.dispose(), [geometry]);

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

  useEffect(() => {
    const st = stage.current;
    if (!st || !view) return;
    const edgeGeometry = new BufferGeometry();
    edgeGeometry.setAttribute('position', new BufferAttribute(view.edges, 3));
    const edgeMaterial = new LineBasicMaterial({ color: '#1d3a4a' });
    const objects: Object3D[] = [new Mesh(view.geometry, st.materials.kernel), new LineSegments(edgeGeometry, edgeMaterial)];
    st.show(objects, view.profile);
    return () => {
      st.show([], null);
      edgeGeometry.dispose();
      edgeMaterial.dispose();
    };
  }, [view]);

  if (!profile && !view) return <p className="p-6 text-finding-error">Nothing to show: the plate cannot be laid out.</p>;
  const pending = kernel.kind === 'ready' && kernel.profile !== profile;
  return (
    <div className="relative h-full w-full bg-gradient-to-b from-blast-50 to-blast-200" data-testid="plate-3d" data-source={kernel.kind === 'ready' ? 'kernel' : kernel.kind}
      data-kernel-ms={timing?.kernelMs.toFixed(1)} data-mesh-ms={timing?.meshMs.toFixed(1)} data-critical-ms={timing?.criticalMs.toFixed(1)} data-parallel={timing ? String(timing.parallel) : undefined} data-updates={timing?.updates}
      data-round-trip-ms={timing?.roundTripMs.toFixed(1)} data-geometry-ms={timing?.geometryMs.toFixed(1)}>
      <div ref={host} className="absolute inset-0" />
      {noWebGl && <p className="absolute inset-x-4 top-12 rounded bg-white/95 p-3 text-sm" role="alert">The 3D view needs WebGL, which this browser does not offer ({noWebGl}). The drawing and every export still work.</p>}
      <div className="pointer-events-none absolute bottom-0 inset-x-0 flex flex-wrap gap-x-4 bg-white/90 px-2 py-1 text-[13px]">
        <span><span className="mr-1 inline-block h-3 w-3 rounded-sm bg-[#e8d7b0] ring-1 ring-brass-700" />transmission side (up)</span>
        <span><span className="mr-1 inline-block h-3 w-3 rounded-sm bg-[#9db7c6] ring-1 ring-plate-900" />engine side</span>
        <span className="text-xs text-plate-500">
          {kernel.kind === 'ready'
            ? `CAD kernel solid, verified, built in ${kernel.buildMs.toFixed(0)} ms`
            : kernel.kind === 'failed' && view
              ? 'last verified solid — not the plate as it is now'
              : 'the CAD kernel shows the verified solid here'}{' '}
          · drag to orbit, wheel to zoom
        </span>
      </div>
      {kernel.kind === 'loading' && (
        <div className="absolute left-2 top-2 w-72 rounded bg-white/95 p-2 text-sm shadow" role="status" data-testid="kernel-progress">
          <p className="font-semibold">{kernel.progress?.phase === 'starting' ? 'Starting the CAD kernel…' : 'Loading the CAD kernel (first use)…'}</p>
          <div className="mt-1 h-2 overflow-hidden rounded bg-blast-200"><div className="h-full bg-plate-700 transition-all" style={{ width: `${Math.round(progressFraction(kernel.progress) * 100)}%` }} /></div>
          <p className="mt-1 text-xs text-plate-500">The drawing, the checks and every export work meanwhile.</p>
        </div>
      )}
      {kernel.kind === 'failed' && <p className="absolute left-2 top-2 max-w-md rounded bg-finding-error px-2 py-1 text-sm font-semibold text-white" role="alert">{kernel.message}</p>}
      {kernel.kind === 'ready' && pending && <span className="absolute left-2 top-2 rounded bg-plate-900 px-2 py-0.5 text-xs font-semibold text-white" role="status" data-testid="rebuilding">rebuilding…</span>}
    </div>
  );
}

interface Stage {
  readonly materials: { readonly kernel: MeshStandardMaterial[] };
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
  const std = (color: string, metalness: number, roughness: number) => new MeshStandardMaterial({ color, metalness, roughness });
  const materials = {
    kernel: [std('#9db7c6', 0.25, 0.5), std('#e8d7b0', 0.25, 0.5), std('#b9c6cc', 0.35, 0.45)],
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
