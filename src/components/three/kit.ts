/**
 * The part of three.js the app draws with, in one module. Every 3D view imports three.js through
 * here (statically or with `import()`), so the bundler keeps only these classes: a namespace import
 * of 'three' anywhere would ship the whole library to every page with a 3D view.
 */
export {
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
  Points,
  PointsMaterial,
  Scene,
  WebGLRenderer,
  type Object3D,
} from 'three';
export { OrbitControls } from 'three/examples/jsm/controls/OrbitControls.js';
