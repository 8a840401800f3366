import { useEffect, useRef, useState } from 'react';

/**
 * The point cloud in 3D (three.js points, thinned for display). Face points in slate, points off
 * the face (bore walls, strays) in brass. Drag to turn, wheel to zoom.
 */
export function MeasurementCloud({ cloud }: { cloud: { xyz: Float32Array; onFace: Uint8Array } | null }) {
  const host = useRef<HTMLDivElement>(null);
  const [problem, setProblem] = useState<string | null>(null);
  useEffect(() => {
    if (!cloud || !host.current) return;
    let disposed = false;
    let cleanup = () => {};
    void (async () => {
      const THREE = await import('../three/kit');
      const { OrbitControls } = THREE;
      if (disposed || !host.current) return;
      const el = host.current;
      const width = el.clientWidth || 360;
      const height = 300;
      let renderer: import('../three/kit').WebGLRenderer;
      try {
        renderer = new THREE.WebGLRenderer({ antialias: true, preserveDrawingBuffer: true });
      } catch {
        setProblem('This browser cannot draw 3D (WebGL is off); the flattened face and the fits work without it.');
        return;
      }
      renderer.setPixelRatio(Math.min(2, window.devicePixelRatio || 1));
      renderer.setSize(width, height);
      renderer.setClearColor(0xf6f8f9);
      el.appendChild(renderer.domElement);
      const scene = new THREE.Scene();
      const geometry = new THREE.BufferGeometry();
      geometry.setAttribute('position', new THREE.BufferAttribute(cloud.xyz, 3));
      const colours = new Float32Array(cloud.onFace.length * 3);
      for (let i = 0; i < cloud.onFace.length; i++) {
        const [r, g, b] = cloud.onFace[i] ? [0.18, 0.35, 0.44] : [0.73, 0.51, 0.1];
        colours[3 * i] = r;
        colours[3 * i + 1] = g;
        colours[3 * i + 2] = b;
      }
      geometry.setAttribute('color', new THREE.BufferAttribute(colours, 3));
      geometry.computeBoundingSphere();
      const radius = geometry.boundingSphere?.radius ?? 100;
      const material = new THREE.PointsMaterial({ size: Math.max(radius / 400, 0.2), vertexColors: true });
      scene.add(new THREE.Points(geometry, material));
      const camera = new THREE.PerspectiveCamera(40, width / height, radius / 100, radius * 20);
      camera.position.set(radius * 0.9, -radius * 1.6, radius * 1.6);
      camera.up.set(0, 0, 1);
      const controls = new OrbitControls(camera, renderer.domElement);
      controls.target.set(0, 0, 0);
      controls.update();
      let frame = 0;
      const draw = () => {
        frame = requestAnimationFrame(draw);
        renderer.render(scene, camera);
      };
      draw();
      cleanup = () => {
        cancelAnimationFrame(frame);
        controls.dispose();
        geometry.dispose();
        material.dispose();
        renderer.dispose();
        renderer.domElement.remove();
      };
    })();
    return () => {
      disposed = true;
      cleanup();
    };
  }, [cloud]);
  return (
    <div>
      <div ref={host} className="overflow-hidden rounded border border-blast-200" data-testid="cloud-view" style={{ minHeight: 300 }} />
      <p className="mt-1 text-xs text-plate-700">{problem ?? 'Drag to turn, scroll to zoom. Slate: face points; brass: off the face (bore wall, strays). Shown thinned; fits use every point.'}</p>
    </div>
  );
}
