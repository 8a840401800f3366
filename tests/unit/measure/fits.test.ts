import { describe, expect, it } from 'vitest';
import { levenbergMarquardt } from 'ml-levenberg-marquardt';
import { Matrix, SingularValueDecomposition } from 'ml-matrix';
import { fitCircle } from '../../../src/domain/fit/circle';
import { fitCylinder } from '../../../src/domain/fit/cylinder';
import { fitPlane, faceAxes } from '../../../src/domain/fit/plane';
import { fitPlaneRansac } from '../../../src/domain/fit/ransacPlane';
import { MeasureSession } from '../../../src/domain/measure/session';
import { findHoles, fitHoleInRegion } from '../../../src/domain/measure/holes';
import { holeQuality } from '../../../src/domain/measure/holeQuality';
import { parseMeasureFile } from '../../../src/domain/measure/formats';
import { BELL_FACE, SMALL_FACE, faceFrame, holeCentreXyz, makeFace, seeded, writeStlBinary } from '../../fixtures/measure/syntheticFace';

const bell = makeFace(BELL_FACE);
const session = new MeasureSession(bell.points);

/** Geometric circle by the general-purpose npm solver, analytic jacobian, from a given start. */
function npmCircle(uv: Float64Array, start: [number, number, number]) {
  const n = uv.length / 2;
  const xs = Array.from({ length: n }, (_, i) => i);
  const model = ([a, b, r]: number[]) => (i: number) => Math.hypot(uv[2 * i]! - a!, uv[2 * i + 1]! - b!) - r!;
  const jacobian = ([a, b]: number[]) => (i: number) => {
    const d = Math.hypot(uv[2 * i]! - a!, uv[2 * i + 1]! - b!);
    return [-(uv[2 * i]! - a!) / d, -(uv[2 * i + 1]! - b!) / d, -1];
  };
  return levenbergMarquardt({ x: xs, y: new Array(n).fill(0) }, model, { initialValues: start, jacobianFunction: jacobian, maxIterations: 300, errorTolerance: 0, damping: 1e-6, improvementThreshold: 1e-15 } as never).parameterValues;
}

describe('face plane: robust, and the least-squares plane of its inliers', () => {
  const plane = session.faceFit().fit;

  it('agrees with ml-matrix SVD of the inliers to 1e-9', () => {
    // reference: centroid + right singular vector of the least singular value (common practice for orthogonal LS planes)
    const rows: number[][] = [];
    let cx = 0, cy = 0, cz = 0;
    for (let i = 0; i < plane.total; i++) if (plane.inliers[i]) { cx += bell.points[3 * i]!; cy += bell.points[3 * i + 1]!; cz += bell.points[3 * i + 2]!; }
    cx /= plane.n; cy /= plane.n; cz /= plane.n;
    for (let i = 0; i < plane.total; i++) if (plane.inliers[i]) rows.push([bell.points[3 * i]! - cx, bell.points[3 * i + 1]! - cy, bell.points[3 * i + 2]! - cz]);
    const svd = new SingularValueDecomposition(new Matrix(rows), { computeLeftSingularVectors: false });
    const v = svd.rightSingularVectors;
    const k = svd.diagonal.indexOf(Math.min(...svd.diagonal));
    let normal = [v.get(0, k), v.get(1, k), v.get(2, k)];
    if (normal[2]! < 0) normal = normal.map((x) => -x);
    expect(Math.abs(plane.normal.x - normal[0]!)).toBeLessThan(1e-9);
    expect(Math.abs(plane.normal.y - normal[1]!)).toBeLessThan(1e-9);
    expect(Math.abs(plane.normal.z - normal[2]!)).toBeLessThan(1e-9);
    expect(Math.abs(plane.centroid.x - cx)).toBeLessThan(1e-9);
    expect(Math.abs(plane.centroid.z - cz)).toBeLessThan(1e-9);
  });

  it('matches fitPlane on the same inliers, and finds the true face normal through 0.5 % outliers and the bore wall', () => {
    const inl = new Float64Array(plane.n * 3);
    for (let i = 0, k = 0; i < plane.total; i++) if (plane.inliers[i]) inl.set(bell.points.subarray(3 * i, 3 * i + 3), 3 * k++);
    const ls = fitPlane(inl);
    expect(Math.abs(ls.normal.x - plane.normal.x)).toBeLessThan(1e-12);
    expect(Math.abs(ls.flatness - plane.flatness)).toBeLessThan(1e-12);
    const w = faceFrame(BELL_FACE.normal).w;
    // tilt error of a plane through ~125 000 points with σ = 0.02 mm over a 300 mm face: ~1e-6 rad
    expect(Math.acos(plane.normal.x * w[0] + plane.normal.y * w[1] + plane.normal.z * w[2])).toBeLessThan(2e-5);
    // every bore-wall point (1.5 mm and more below the face) and every outlier (≥ 1 mm off) is out,
    // and about the 0.27 % of face points beyond 3σ of Gaussian noise
    expect(plane.outliers).toBeGreaterThanOrEqual(bell.counts.wall + bell.counts.outliers);
    expect(plane.outliers - bell.counts.wall - bell.counts.outliers).toBeLessThan(0.004 * plane.total);
    // the robust σ recovers the fixture's noise
    expect(Math.abs(plane.sigmaMm - BELL_FACE.noiseMm) / BELL_FACE.noiseMm).toBeLessThan(0.05);
  });

  it('gives the same plane for the same points on every run (worker and server agree)', () => {
    const again = fitPlaneRansac(bell.points);
    expect(again.normal).toEqual(plane.normal);
    expect(again.n).toBe(plane.n);
  });
});

describe('automatic hole finding on the synthetic bell-housing face', () => {
  const found = session.run({ kind: 'holes' });
  if (found.kind !== 'holes') throw new Error('expected holes');
  const axes = found.face;
  const toXyz = (u: number, v: number) => [0, 1, 2].map((k) => [axes.origin.x, axes.origin.y, axes.origin.z][k]! + u * [axes.u.x, axes.u.y, axes.u.z][k]! + v * [axes.v.x, axes.v.y, axes.v.z][k]!);
  const match = BELL_FACE.holes.map((truth) => {
    const t = holeCentreXyz(BELL_FACE, truth);
    const best = found.holes
      .map((h) => ({ h, d: Math.hypot(...toXyz(h.centerU, h.centerV).map((x, k) => x - t[k]!) as [number, number, number]) }))
      .sort((a, b) => a.d - b.d)[0]!;
    return { truth, ...best };
  });

  it('finds every hole and no phantom ones', () => {
    expect(found.holes).toHaveLength(BELL_FACE.holes.length);
    expect(new Set(match.map((m) => m.h.id)).size).toBe(BELL_FACE.holes.length);
    expect(found.rejected).toEqual([]);
  });

  it('recovers each round hole’s centre within 3σ/√n-consistent bounds and its diameter', () => {
    for (const { truth, h, d } of match) {
      if (truth.ovalMm || truth.dentMm) continue;
      // centre error of a circle through n rim points with radial noise σ: σ·√(2/n) per axis (common practice)
      const bound = 3 * BELL_FACE.noiseMm * Math.sqrt(2 / h.n) * Math.SQRT2 + 0.002; // + plane tilt over the face
      expect(d, `${truth.id}: centre off by ${d} mm`).toBeLessThan(bound);
      // innermost rim points sit a little inside the edge: at most a noise σ on the diameter
      expect(Math.abs(h.diameterMm - truth.diameterMm), truth.id).toBeLessThan(2 * BELL_FACE.noiseMm);
      expect(h.flags, truth.id).toEqual([]);
    }
  });

  it('flags the oval hole as oval and the dented one as dented, with their sizes', () => {
    const oval = match.find((m) => m.truth.ovalMm)!;
    expect(oval.h.flags).toContain('oval');
    expect(oval.h.flags).not.toContain('dent');
    expect(Math.abs(oval.h.ovalityMm - oval.truth.ovalMm!)).toBeLessThan(0.05);
    // major axis at 30° in the face frame of the fixture (u = global X projected, as in the fit)
    expect(Math.abs(oval.h.ovalityAxisDeg - oval.truth.ovalAxisDeg!)).toBeLessThan(3);
    const dent = match.find((m) => m.truth.dentMm)!;
    expect(dent.h.flags).toContain('dent');
    expect(dent.h.flags).not.toContain('oval');
    expect(Math.abs(dent.h.dentMm - dent.truth.dentMm!)).toBeLessThan(0.15);
    const angleOff = Math.abs(((dent.h.dentAtDeg - dent.truth.dentAtDeg! + 540) % 360) - 180);
    expect(angleOff).toBeLessThan(10);
    expect(found.holes.filter((h) => h.flags.length > 0)).toHaveLength(2);
  });

  it('suggests the eight bolt holes as the pattern (not the bore, not the dowels)', () => {
    const ids = new Set(found.suggestedPattern);
    const bolts = match.filter((m) => m.truth.role === 'bolt').map((m) => m.h.id);
    expect([...ids].sort()).toEqual(bolts.sort());
  });

  it('the geometric fit of each hole agrees with ml-levenberg-marquardt on the same rim points to 1e-9', () => {
    const { uv } = session.faceFit();
    const holes = findHoles(uv);
    for (const h of holes.holes.slice(0, 6)) {
      const rim = new Float64Array(h.rim.length * 2);
      h.rim.forEach((i, k) => {
        rim[2 * k] = uv[2 * i]!;
        rim[2 * k + 1] = uv[2 * i + 1]!;
      });
      const [a, b, r] = npmCircle(rim, [h.centerU + 0.3, h.centerV - 0.2, h.diameterMm / 2 + 0.1]);
      expect(Math.abs(a! - h.centerU), h.id).toBeLessThan(1e-9);
      expect(Math.abs(b! - h.centerV), h.id).toBeLessThan(1e-9);
      expect(Math.abs(2 * r! - h.diameterMm), h.id).toBeLessThan(2e-9);
    }
  });

  it('a box drawn around a hole gives the same hole as the automatic finding', () => {
    const h = found.holes[0]!;
    const half = h.diameterMm;
    const byBox = fitHoleInRegion(session.faceFit().uv, { kind: 'box', uMin: h.centerU - half, uMax: h.centerU + half, vMin: h.centerV - half, vMax: h.centerV + half });
    expect(Math.abs(byBox.centerU - h.centerU)).toBeLessThan(0.005);
    expect(Math.abs(byBox.diameterMm - h.diameterMm)).toBeLessThan(0.01);
  });

  it('finds the holes of a meshed face too (STL vertices only: the grid stops at each rim)', () => {
    const small = makeFace(SMALL_FACE);
    const stl = parseMeasureFile(writeStlBinary(small.points, small.triangles), { fileName: 'small.stl' });
    const r = new MeasureSession(stl.points!).run({ kind: 'holes' });
    if (r.kind !== 'holes') throw new Error('expected holes');
    expect(r.holes).toHaveLength(SMALL_FACE.holes.length);
    // without rim points the edge is where the grid stops: within a grid spacing
    for (const t of SMALL_FACE.holes) expect(r.holes.some((h) => Math.abs(h.diameterMm - t.diameterMm) < SMALL_FACE.spacingMm), t.id).toBe(true);
  });
});

describe('circle fits against a published worked example', () => {
  it('Gander, Golub & Strebel (BIT 1994) six points: ours and ml-levenberg-marquardt both give the published geometric circle', () => {
    const uv = Float64Array.of(1, 7, 2, 6, 5, 8, 7, 7, 9, 5, 3, 7);
    const ours = fitCircle(uv);
    const [a, b, r] = npmCircle(uv, [5, 5, 3]);
    // published: centre (4.7398, 2.9835), r = 4.7142
    for (const [x, want] of [[ours.centerX, 4.7398], [ours.centerY, 2.9835], [ours.radius, 4.7142], [a!, 4.7398], [b!, 2.9835], [r!, 4.7142]] as const) {
      expect(Math.abs(x - want)).toBeLessThan(5e-5);
    }
    // a short arc is ill-conditioned: the two solvers agree to 1e-7 here (1e-9 on full rims above)
    expect(Math.abs(ours.centerX - a!)).toBeLessThan(1e-7);
  });
});

describe('hole quality', () => {
  it('an exact ellipse of axes a, b reads as ovality 2(a − b) along its major axis', () => {
    const a = 5.7;
    const b = 5.3;
    const m = 720;
    const uv = new Float64Array(2 * m);
    const tilt = (40 * Math.PI) / 180;
    for (let i = 0; i < m; i++) {
      const t = (2 * Math.PI * i) / m;
      const x = a * Math.cos(t);
      const y = b * Math.sin(t);
      uv[2 * i] = 3 + x * Math.cos(tilt) - y * Math.sin(tilt);
      uv[2 * i + 1] = -2 + x * Math.sin(tilt) + y * Math.cos(tilt);
    }
    const q = holeQuality(uv, fitCircle(uv));
    // hand: r(θ) ≈ (a + b)/2 + ((a − b)/2)·cos 2θ, so major − minor diameter = 2(a − b) = 0.8 mm
    expect(Math.abs(q.ovalityMm - 0.8)).toBeLessThan(0.02);
    expect(Math.abs(q.ovalityAxisDeg - 40)).toBeLessThan(1);
    expect(q.flags).toContain('oval');
    expect(q.flags).not.toContain('dent');
    expect(q.arcCoverageDeg).toBeGreaterThan(359);
  });
  it('a rim seen on a third of the circle, or with few points, is flagged', () => {
    const m = 40;
    const uv = new Float64Array(2 * m);
    for (let i = 0; i < m; i++) {
      const t = ((2 * Math.PI) / 3) * (i / (m - 1));
      uv[2 * i] = 5 * Math.cos(t);
      uv[2 * i + 1] = 5 * Math.sin(t);
    }
    const q = holeQuality(uv, fitCircle(uv));
    expect(q.flags).toContain('short-arc');
    expect(Math.abs(q.arcCoverageDeg - 120)).toBeLessThan(1);
    const few = uv.subarray(0, 10);
    expect(holeQuality(few, fitCircle(few)).flags).toContain('few-points');
  });
});

describe('cylinder (bore) fit', () => {
  /** points on a cylinder of radius r about a tilted axis, over an arc, with noise */
  function bore(r: number, arcDeg: number, noise: number, seed: number) {
    const rand = seeded(seed);
    const d = [0.08, -0.05, 1];
    const l = Math.hypot(...d);
    const dir = d.map((x) => x / l);
    const e1 = [1 - dir[0]! * dir[0]!, -dir[0]! * dir[1]!, -dir[0]! * dir[2]!];
    const l1 = Math.hypot(...e1);
    const u = e1.map((x) => x / l1);
    const v = [dir[1]! * u[2]! - dir[2]! * u[1]!, dir[2]! * u[0]! - dir[0]! * u[2]!, dir[0]! * u[1]! - dir[1]! * u[0]!];
    const m = 3000;
    const xyz = new Float64Array(3 * m);
    for (let i = 0; i < m; i++) {
      const t = ((arcDeg * Math.PI) / 180) * rand();
      const h = -20 * rand();
      const rr = r + noise * (rand() + rand() + rand() - 1.5) * 2;
      for (let k = 0; k < 3; k++) xyz[3 * i + k] = [12, -7, 3][k]! + h * dir[k]! + rr * (Math.cos(t) * u[k]! + Math.sin(t) * v[k]!);
    }
    return { xyz, dir };
  }

  it('recovers radius and axis of a full bore and of a 200° arc', () => {
    for (const arc of [360, 200]) {
      const { xyz, dir } = bore(45, arc, 0.01, arc);
      const c = fitCylinder(xyz);
      expect(Math.abs(c.radius - 45), `arc ${arc}`).toBeLessThan(0.01);
      const dot = Math.abs(c.axisDirection.x * dir[0]! + c.axisDirection.y * dir[1]! + c.axisDirection.z * dir[2]!);
      expect(Math.acos(Math.min(1, dot)), `arc ${arc}`).toBeLessThan(1e-3);
      // the axis passes through (12, −7, 3)
      const p = [12 - c.axisPoint.x, -7 - c.axisPoint.y, 3 - c.axisPoint.z];
      const t = p[0]! * c.axisDirection.x + p[1]! * c.axisDirection.y + p[2]! * c.axisDirection.z;
      const off = Math.hypot(p[0]! - t * c.axisDirection.x, p[1]! - t * c.axisDirection.y, p[2]! - t * c.axisDirection.z);
      expect(off, `arc ${arc}`).toBeLessThan(0.02);
      expect(Math.abs(c.arcCoverageDeg - arc)).toBeLessThan(2);
    }
  });

  it('agrees with ml-levenberg-marquardt minimising the same distances', () => {
    const { xyz } = bore(30, 360, 0.02, 5);
    const c = fitCylinder(xyz);
    const n = xyz.length / 3;
    // parameters: axis through (px, py, 0) with direction (dx, dy, 1); valid for a bore roughly along z
    const dist = ([px, py, dx, dy]: number[], i: number) => {
      const l = Math.hypot(dx!, dy!, 1);
      const ax = dx! / l;
      const ay = dy! / l;
      const az = 1 / l;
      const x = xyz[3 * i]! - px!;
      const y = xyz[3 * i + 1]! - py!;
      const z = xyz[3 * i + 2]!;
      const t = x * ax + y * ay + z * az;
      return Math.hypot(x - t * ax, y - t * ay, z - t * az);
    };
    const xs = Array.from({ length: n }, (_, i) => i);
    const fit = levenbergMarquardt({ x: xs, y: new Array(n).fill(0) }, (p: number[]) => (i: number) => dist(p, i) - p[4]!, {
      initialValues: [11.5, -6.5, 0.05, -0.03, 29],
      gradientDifference: 1e-7,
      centralDifference: true,
      maxIterations: 300,
      errorTolerance: 0,
      damping: 1e-6,
      improvementThreshold: 1e-15,
    } as never).parameterValues;
    expect(Math.abs(fit[4]! - c.radius)).toBeLessThan(1e-6);
    const l = Math.hypot(fit[2]!, fit[3]!, 1);
    const dot = (fit[2]! * c.axisDirection.x + fit[3]! * c.axisDirection.y + c.axisDirection.z) / l;
    expect(1 - Math.abs(dot)).toBeLessThan(1e-10);
  });

  it('the session fits the bore of the synthetic face and says where its axis meets the face', () => {
    const holes = session.run({ kind: 'holes' });
    if (holes.kind !== 'holes') throw new Error('expected holes');
    const boreHole = holes.holes.find((h) => h.diameterMm > 100)!;
    const r = session.run({ kind: 'cylinder', region: { kind: 'box', uMin: boreHole.centerU - 65, uMax: boreHole.centerU + 65, vMin: boreHole.centerV - 65, vMax: boreHole.centerV + 65 } });
    if (r.kind !== 'cylinder') throw new Error('expected a cylinder');
    expect(Math.abs(r.cylinder.diameterMm - 110)).toBeLessThan(0.01);
    expect(r.axisOnFace.tiltDeg).toBeLessThan(0.05);
    // the bore wall is square to the face and centred where the bore's rim is
    expect(Math.hypot(r.axisOnFace.u - boreHole.centerU, r.axisOnFace.v - boreHole.centerV)).toBeLessThan(0.01);
    expect(faceAxes(session.faceFit().fit).w).toEqual(r.face.w);
  });
});
