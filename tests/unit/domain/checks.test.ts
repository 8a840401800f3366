import { describe, expect, it } from 'vitest';
import { checkPlate, countFindings, layoutIsDisjoint, layoutProblems, type Finding } from '../../../src/domain/checks';
import { plateProfile } from '../../../src/domain/profile';
import { MIN_WALL_MM, sampleChain } from '../../../src/domain/layout';
import { distanceToOutline, pointInOutline } from '../../../src/domain/outline';
import type { PlateSpec } from '../../../src/domain/spec';
import { plate, starterInput } from './plateFixture';

const IN = 25.4;

function findings(spec: PlateSpec, code: string, id?: string): Finding[] {
  return checkPlate(spec).filter((f) => f.code === code && (id === undefined || f.featureIds.includes(id)));
}

function only(spec: PlateSpec, code: string, id?: string): Finding {
  const fs = findings(spec, code, id);
  expect(fs, `${code}${id ? ` on ${id}` : ''}`).toHaveLength(1);
  return fs[0]!;
}

describe('the base fixture', () => {
  it('passes every check: notes only', () => {
    const all = checkPlate(plate());
    expect(countFindings(all)).toEqual({ error: 0, warning: 0, note: all.length });
    for (const f of all) {
      expect(f.rule.length).toBeGreaterThan(0);
      expect(f.source.length).toBeGreaterThan(0);
    }
  });
});

describe('holes of the two faces: overlap, ligament, spacing', () => {
  it('overlap: a transmission pattern put on top of the engine pattern', () => {
    // Ø200 from 45° (mirrored: 135°, 45°, …) lands exactly on E1–E4
    const bad = plate((s) => {
      s.transmissionFace.patterns[0] = { id: 'TB', diameterMm: 200, count: 4, startAngleDeg: 45 };
    });
    const f = findings(bad, 'layout.overlap', 'E1');
    expect(f).toHaveLength(1);
    expect(f[0]!.severity).toBe('error');
    expect(findings(plate(), 'layout.overlap')).toHaveLength(0);
  });

  // E1 at (70.711, 70.711), Ø11. A tapped M8 hole (tap drill 6.8) toward the centre at wall w:
  // centre distance 5.5 + 3.4 + w. Measured from the front, so x is entered mirrored.
  const near = (wallMm: number) =>
    plate((s) => {
      const d = 5.5 + 3.4 + wallMm;
      const k = 1 - d / 100;
      s.transmissionFace.holes.push({ id: 'T5', x: -70.71067811865476 * k, y: 70.71067811865476 * k, role: 'tapped', fastener: 'M8x1.25' });
    });

  it('ligament under the 0.8 mm minimum machinable wall is an error (DFM guides 0.5–0.8 mm)', () => {
    const f = only(near(0.5), 'layout.ligament', 'T5');
    expect(f.severity).toBe('error');
    expect(f.message).toContain('0.50 mm');
    expect(f.at).toHaveProperty('from');
    expect(findings(near(1.0), 'layout.ligament')).toHaveLength(0);
  });

  it('hole spacing under 2.2·d0 is a warning (EN 1993-1-8 Table 3.3, p1 ≥ 2.2 d0)', () => {
    // d0 = 11 (the larger hole): 2.2 × 11 = 24.2 mm between centres
    const f = only(near(24.0 - 8.9), 'layout.pitch', 'T5');
    expect(f.severity).toBe('warning');
    expect(f.message).toContain('24.20 mm');
    expect(findings(near(24.5 - 8.9), 'layout.pitch')).toHaveLength(0);
  });
});

describe('edge distance (EN 1993-1-8 Table 3.3: e ≥ 1.2·d0 minimum, 1.5·d0 recommended)', () => {
  // E1 is Ø11: its edge distance is 5.5 + edge margin; 1.2·11 = 13.2, 1.5·11 = 16.5
  const withMargin = (m: number) => plate((s) => (s.outline.edgeMarginMm = m));
  it('under 1.2·d0 is an error', () => {
    const f = only(withMargin(7), 'edge.minimum', 'E1');
    expect(f.severity).toBe('error');
    expect(f.message).toContain('12.50 mm');
    expect(findings(withMargin(8), 'edge.minimum', 'E1')).toHaveLength(0);
  });
  it('under 1.5·d0 is a warning', () => {
    expect(only(withMargin(10.9), 'edge.recommended', 'E1').severity).toBe('warning');
    expect(findings(withMargin(11.1), 'edge.recommended', 'E1')).toHaveLength(0);
  });
});

describe('features breaking through the outline', () => {
  const square = (half: number) =>
    plate((s) => {
      s.outline = { kind: 'polygon', points: [{ x: -half, y: -half }, { x: half, y: -half }, { x: half, y: half }, { x: -half, y: half }] };
    });
  it('a hole cut by a polygon outline is an error; inside it is not (common practice)', () => {
    // E1 centre at 70.71: a ±74 square leaves 3.29 mm to the edge, less than its 5.5 mm radius
    const f = only(square(74), 'outline.breakthrough', 'E1');
    expect(f.severity).toBe('error');
    expect(f.message).toMatch(/breaks through/);
    expect(findings(square(130), 'outline.breakthrough')).toHaveLength(0);
  });
  it('the edge chamfer counts against the wall', () => {
    // ±105 square: ED1 (Ø8 at x = 100) keeps 105 − 100 − 4 = 1 mm of wall; with a 1 mm chamfer it needs 1.8
    const withChamfer = (c: number) =>
      plate((s) => {
        s.outline = { kind: 'polygon', points: [{ x: -105, y: -130 }, { x: 105, y: -130 }, { x: 105, y: 130 }, { x: -105, y: 130 }] };
        s.edgeChamferMm = c;
      });
    expect(findings(withChamfer(0), 'outline.breakthrough', 'ED1')).toHaveLength(0);
    expect(only(withChamfer(1), 'outline.breakthrough', 'ED1').message).toContain('1.00 mm of wall');
  });
});

describe('clearance holes against ISO 273 / ASME B18.2.8', () => {
  const sized = (d: number, fastener = 'M10x1.5') =>
    plate((s) => {
      s.engineFace.holes[0].diameterMm = d;
      s.engineFace.holes[0].fastener = fastener;
    });
  it('above the coarse series is a warning (ISO 273: M10 coarse 12.0 mm)', () => {
    expect(only(sized(12.5), 'clearance.range', 'E1').severity).toBe('warning');
    expect(findings(sized(12.0), 'clearance.range')).toHaveLength(0);
  });
  it('below the fine series is a warning (ISO 273: M10 fine 10.5 mm)', () => {
    expect(only(sized(10.3), 'clearance.range', 'E1').severity).toBe('warning');
    expect(findings(sized(10.5), 'clearance.range')).toHaveLength(0);
  });
  it('no larger than the bolt is an error', () => {
    expect(only(sized(10.0), 'clearance.tooSmall', 'E1').severity).toBe('error');
  });
  it('inch bolts use ASME B18.2.8: 3/8 loose 0.422 in', () => {
    expect(only(sized(0.43 * IN, '3/8'), 'clearance.range', 'E1').severity).toBe('warning');
    expect(findings(sized(0.42 * IN, '3/8'), 'clearance.range')).toHaveLength(0);
  });
});

describe('thread engagement in the plate (≈2×D aluminium, general rule; VDI 2230 example)', () => {
  const depth = (d: number, kind = 'aluminium') =>
    plate((s) => {
      s.transmissionFace.holes[0].threadDepthMm = d;
      s.material = { name: kind, densityGPerCm3: 2.7, kind };
    });
  it('under 2×D in aluminium is a warning (M8: 16 mm)', () => {
    const f = only(depth(14), 'thread.engagement', 'T1');
    expect(f.severity).toBe('warning');
    expect(f.message).toContain('1.75×D');
    expect(findings(depth(16), 'thread.engagement')).toHaveLength(0);
  });
  it('under 1.5×D in aluminium is an error (M8: 12 mm)', () => {
    expect(only(depth(11), 'thread.engagement', 'T1').severity).toBe('error');
    expect(only(depth(12), 'thread.engagement', 'T1').severity).toBe('warning');
  });
  it('≈1×D is enough in steel', () => {
    expect(findings(depth(9, 'steel'), 'thread.engagement')).toHaveLength(0);
    expect(only(depth(7, 'steel'), 'thread.engagement', 'T1').severity).toBe('warning');
  });
  it('the thread depth is limited by the plate thickness', () => {
    const thin = plate((s) => (s.thicknessMm = 14));
    // 14 mm plate: every M8 hole engages 14 mm = 1.75×D
    expect(findings(thin, 'thread.engagement').map((f) => f.severity)).toEqual(['warning', 'warning', 'warning', 'warning']);
    const asked = plate((s) => {
      s.thicknessMm = 14;
      s.transmissionFace.holes[0].threadDepthMm = 18;
    });
    expect(only(asked, 'thread.depthLimited', 'T1').severity).toBe('note');
  });
});

describe('bolt heads under the other flange and counterbores (ISO 4762 heads)', () => {
  // an explicit bell-housing footprint that covers the whole engine pattern
  const covered = (change: (s: any) => void = () => {}) =>
    plate((s) => {
      s.transmissionFace.flangeFootprint = {
        kind: 'polygon',
        points: [{ x: -130, y: -130 }, { x: 130, y: -130 }, { x: 130, y: 130 }, { x: -130, y: 130 }],
      };
      change(s);
    });
  it('an engine-face bolt head under the transmission flange without a counterbore is an error', () => {
    const f = only(covered(), 'counterbore.missing', 'E1');
    expect(f.severity).toBe('error');
    // ISO 4762 M10: dk = 16, k = 10 (REFERENCES.md)
    expect(f.message).toContain('Ø16.00 mm × 10.00 mm');
    expect(f.message).toContain('transmission side');
    expect(findings(plate(), 'counterbore.missing')).toHaveLength(0);
  });
  it('the default hull footprint: a transmission pattern bigger than the engine pattern covers its heads', () => {
    const big = plate((s) => (s.transmissionFace.patterns[0] = { id: 'TB', diameterMm: 260, count: 4, startAngleDeg: 0 }));
    expect(findings(big, 'counterbore.missing')).toHaveLength(4);
  });
  it('a counterbore from the head side, deep enough, clears it', () => {
    const ok = covered((s) => s.engineFace.holes.forEach((h: any) => h.role === 'clearance' && (h.counterbore = {})));
    expect(findings(ok, 'counterbore.missing')).toHaveLength(0);
    expect(findings(ok, 'counterbore.shallow')).toHaveLength(0);
  });
  it('a counterbore too shallow for the head is an error', () => {
    const shallow = covered((s) => s.engineFace.holes.forEach((h: any) => h.role === 'clearance' && (h.counterbore = { depthMm: 8 })));
    expect(only(shallow, 'counterbore.shallow', 'E1').severity).toBe('error');
  });
  it('a counterbore from the wrong side does not count', () => {
    const wrong = covered((s) => s.engineFace.holes.forEach((h: any) => h.role === 'clearance' && (h.counterbore = { side: 'engine' })));
    expect(findings(wrong, 'counterbore.missing')).toHaveLength(4);
  });
});

describe('counterbore floor and depth', () => {
  // default M10 counterbore depth: k 10 + 0.5 = 10.5 mm
  const cb = (thicknessMm: number, depthMm?: number) =>
    plate((s) => {
      s.thicknessMm = thicknessMm;
      s.engineFace.holes[0].counterbore = depthMm === undefined ? {} : { depthMm };
    });
  it('a floor under 0.5·d is a warning (common practice)', () => {
    // 15 mm plate: floor 4.5 < 5
    expect(only(cb(15), 'counterbore.floor', 'E1').severity).toBe('warning');
    expect(findings(cb(16), 'counterbore.floor')).toHaveLength(0);
  });
  it('a floor under 1.5 mm is an error (common practice, from memory)', () => {
    expect(only(cb(11.5), 'counterbore.floor', 'E1').severity).toBe('error');
  });
  it('a counterbore as deep as the plate is an error', () => {
    expect(only(cb(20, 20), 'counterbore.throughPlate', 'E1').severity).toBe('error');
    expect(findings(cb(20, 19), 'counterbore.throughPlate')).toHaveLength(0);
  });
});

describe('dowels', () => {
  it('fewer than two dowels on a face is a warning (common practice: dowels locate, bolts clamp)', () => {
    const one = plate((s) => s.transmissionFace.holes.pop());
    const f = only(one, 'dowel.count');
    expect(f.severity).toBe('warning');
    expect(f.message).toMatch(/transmission face has one dowel/);
    expect(findings(plate(), 'dowel.count')).toHaveLength(0);
  });
  it('the dowel fit is shown as limits: Ø8 H7 → 8.000 … 8.015 (ISO 286, 6–10 mm IT7 = 15 µm)', () => {
    const f = only(plate(), 'dowel.fit', 'ED1');
    expect(f.severity).toBe('note');
    expect(f.message).toContain('8.000 mm … 8.015 mm');
    const none = plate((s) => {
      s.engineFace.holes.splice(4, 2);
    });
    expect(findings(none, 'dowel.fit', 'ED1')).toHaveLength(0);
  });
});

describe('axis alignment of a fitted pattern (SAE J617 runout TIR; TIR = 2 × offset)', () => {
  const fitted = (cx: number, cy: number, placedX = 0, rmsMm = 0.01) =>
    plate((s) => {
      s.transmissionFace.patterns[0].fitted = { centerX: cx, centerY: cy, rmsMm };
      s.transmissionFace.patterns[0].centerX = placedX;
    });
  it('beyond the 0.005 in TIR (passenger-car bell housings, common practice) is an error', () => {
    // offset 0.08 → TIR 0.16 mm > 0.127 mm
    const f = only(fitted(0.08, 0), 'alignment.offset');
    expect(f.severity).toBe('error');
    expect(f.featureIds).toEqual(['T1', 'T2', 'T3', 'T4']);
    // offset 0.05 → TIR 0.10 mm: within
    expect(only(fitted(0.05, 0), 'alignment.offset').severity).toBe('note');
  });
  it('placing the pattern at its fitted centre puts the shaft axis on the crank axis', () => {
    expect(only(fitted(0.08, 0, 0.08), 'alignment.offset').severity).toBe('note');
  });
  it('SAE J617 size 3 (bore 16.125 in): 0.008 in TIR allowed', () => {
    const tol = plate((s) => {
      s.tolerances = { alignmentTirMm: 0.008 * IN };
      s.transmissionFace.patterns[0].fitted = { centerX: 0.09, centerY: 0, rmsMm: 0.01 };
    });
    // TIR 0.18 mm < 0.2032 mm
    expect(only(tol, 'alignment.offset').severity).toBe('note');
  });
  it('a scattered fit is a warning (common practice)', () => {
    expect(only(fitted(0, 0, 0, 0.08), 'alignment.fitScatter').severity).toBe('warning');
    expect(findings(fitted(0, 0, 0, 0.04), 'alignment.fitScatter')).toHaveLength(0);
  });
});

describe('starter nose bore against the gear centre distance (ISO 21771: a = m(z1 + z2)/2)', () => {
  // m = 2.5, z = 100 + 10: a = 137.5 mm; warning beyond 0.1·m = 0.25, error beyond 0.25·m = 0.625
  const at = (distanceMm?: number) =>
    plate((s) => (s.starter = distanceMm === undefined ? starterInput() : { ...starterInput(), centreDistanceMm: distanceMm }));
  it('on the centre distance: a note stating it', () => {
    const f = only(at(), 'starter.centreDistance');
    expect(f.severity).toBe('note');
    expect(f.message).toContain('137.500 mm');
    expect(only(at(137.7), 'starter.centreDistance').severity).toBe('note');
  });
  it('off by more than 0.1·m is a warning, by more than 0.25·m an error', () => {
    expect(only(at(137.9), 'starter.centreDistance').severity).toBe('warning');
    const f = only(at(138.3), 'starter.centreDistance');
    expect(f.severity).toBe('error');
    expect(f.message).toMatch(/too shallow/);
    expect(only(at(136.5), 'starter.centreDistance').message).toMatch(/too deep/);
  });
});

describe('pockets (starter recess)', () => {
  const recess = (depthMm: number, diameterMm = 70, tangentialMm = 45) =>
    plate((s) => {
      const st = starterInput();
      st.mountingHoles[0].tangentialMm = tangentialMm;
      s.starter = { ...st, recess: { depthMm, shape: { kind: 'circle', diameterMm } } };
    });
  it('the wall to the plate edge is the worst of every sample along the pocket edge (the search skips none that could be worse)', () => {
    const inSquare = (diameterMm: number) =>
      plate((s) => {
        const st = starterInput();
        st.mountingHoles[0].tangentialMm = 20;
        s.starter = { ...st, recess: { depthMm: 3, shape: { kind: 'circle', diameterMm } } };
        s.outline = { kind: 'polygon', points: [{ x: -175, y: -175 }, { x: 175, y: -175 }, { x: 175, y: 175 }, { x: -175, y: 175 }] };
      });
    let seen = 0;
    let clear = 0;
    for (let d = 40; d <= 100; d += 1.7) {
      const spec = inSquare(d);
      const profile = plateProfile(spec);
      const pocket = profile.pockets[0]!;
      // every sample measured, as a reference
      let worst = Infinity;
      let at: { x: number; y: number } | null = null;
      for (const q of sampleChain(pocket.outline, 0.5)) {
        const dist = pointInOutline(profile.outline, q) ? distanceToOutline(profile.outline, q) : -distanceToOutline(profile.outline, q);
        if (dist < worst) {
          worst = dist;
          at = q;
        }
      }
      const f = findings(spec, 'outline.breakthrough', pocket.id);
      if (worst < MIN_WALL_MM + profile.edgeChamferMm) {
        seen++;
        expect(f).toHaveLength(1);
        expect(f[0]!.at).toEqual(at);
        if (worst >= 0) expect(f[0]!.message).toContain(`${worst.toFixed(2)} mm of wall`);
        else expect(f[0]!.message).toMatch(/breaks through/);
      } else {
        clear++;
        expect(f).toHaveLength(0);
      }
    }
    expect(seen).toBeGreaterThan(3);
    expect(clear).toBeGreaterThan(3);

    // the kernel's layout gate says the same as measuring every sample, for walls either side of the limit
    let refused = 0;
    for (let d = 40; d <= 100; d += 1.7) {
      for (const wall of [0.8, 3, 12]) {
        const profile = plateProfile(inSquare(d));
        const pocket = profile.pockets[0]!;
        const need = wall + profile.edgeChamferMm;
        const every = sampleChain(pocket.outline, 0.5).some((q) => !pointInOutline(profile.outline, q) || distanceToOutline(profile.outline, q) < need - 1e-9);
        const said = layoutProblems(profile, { minWallMm: wall }).some((m) => m.startsWith(`pocket ${pocket.id} is not inside the outline`));
        expect(said).toBe(every);
        if (every) refused++;
      }
    }
    expect(refused).toBeGreaterThan(3);
  });

  it('deeper than the plate is an error; a thin floor a warning (common practice)', () => {
    expect(only(recess(20), 'pocket.throughPlate').severity).toBe('error');
    expect(only(recess(19), 'pocket.floor').severity).toBe('warning');
    expect(findings(recess(3), 'pocket.floor')).toHaveLength(0);
    expect(findings(recess(3), 'pocket.throughPlate')).toHaveLength(0);
  });
  it('a hole crossing the pocket edge is an error', () => {
    // SM1 (Ø6.8) at 36 mm from the nose centre: a Ø70 pocket edge runs through it
    expect(only(recess(3, 70, 36), 'pocket.edge', 'SM1').severity).toBe('error');
    expect(findings(recess(3, 70, 45), 'pocket.edge')).toHaveLength(0);
  });
  it('a tapped hole inside the pocket engages only the floor', () => {
    // SM1 at 20 mm, inside a Ø70 × 3 pocket: 17 mm of a 20 mm plate left = 2.125 D, then 5 deep: 15 mm
    expect(findings(recess(3, 70, 20), 'thread.engagement', 'SM1')).toHaveLength(0);
    expect(only(recess(5, 70, 20), 'thread.engagement', 'SM1').severity).toBe('warning');
  });
});

describe('thickness: stack-up and stock', () => {
  // required = crank flange 10 + flywheel 40 − bell-face-to-friction-face 30 = 20 mm;
  // worst case ±(0.1 + 0.1 + 0.15) = ±0.35 mm
  const chain = {
    crankFlangePositionMm: { nominalMm: 10, plusMm: 0.1, minusMm: 0.1 },
    flywheelDepthMm: { nominalMm: 40, plusMm: 0.1, minusMm: 0.1 },
    requiredBellFaceToFrictionFaceMm: { nominalMm: 30, plusMm: 0.15, minusMm: 0.15 },
  };
  const thick = (t: number) =>
    plate((s) => {
      s.thicknessMm = t;
      s.stackUp = { plateThickness: chain };
    });
  it('equal to the required thickness: a note', () => {
    const f = only(thick(20), 'thickness.stackUp');
    expect(f.severity).toBe('note');
    expect(f.message).toContain('20.00 mm');
  });
  it('off the required thickness but inside the worst-case band: a warning; outside: an error', () => {
    expect(only(thick(20.3), 'thickness.stackUp').severity).toBe('warning');
    const f = only(thick(21), 'thickness.stackUp');
    expect(f.severity).toBe('error');
    expect(f.message).toContain('needs 20.00 mm');
  });
  it('a chain that needs no plate at all is an error', () => {
    const none = plate((s) => (s.stackUp = { plateThickness: { ...chain, requiredBellFaceToFrictionFaceMm: { nominalMm: 52 } } }));
    expect(only(none, 'thickness.stackUp').severity).toBe('error');
  });
  it('stock: a stock size is a note; between sizes says which stock; beyond the list a warning', () => {
    // metric stock 6, 8, 10, 12, 14, 16, 18, 20, 25 mm (REFERENCES.md)
    expect(only(plate(), 'thickness.stock').message).toContain('stock thickness (20 mm)');
    const between = only(plate((s) => (s.thicknessMm = 19)), 'thickness.stock');
    expect(between.severity).toBe('note');
    expect(between.message).toContain('machined from 20 mm stock, facing off 1.00 mm');
    expect(only(plate((s) => (s.thicknessMm = 26)), 'thickness.stock').severity).toBe('warning');
    // inch stock 1/4 … 1 in (from memory): 19 mm comes from 3/4 in (19.05)
    expect(only(plate((s) => Object.assign(s, { thicknessMm: 19, thicknessStock: 'inch' })), 'thickness.stock').message).toContain('3/4 in');
  });
});

describe('pilot engagement and bottoming', () => {
  // tip at plate − protrusion = 20 − P; engagement = bearing rear face (8) − tip; clearance = tip − bottom (−16)
  const pilot = (protrusionMm: number, plateMm = 20) =>
    plate((s) => {
      s.stackUp = {
        pilot: {
          plateThicknessMm: { nominalMm: plateMm },
          pilotBearingRearFaceMm: { nominalMm: 8 },
          pilotBoreBottomMm: { nominalMm: -16 },
          pilotProtrusionMm: { nominalMm: protrusionMm, plusMm: 0.2, minusMm: 0.2 },
          minimumEngagementMm: 10,
          minimumBottomClearanceMm: 1,
        },
      };
    });
  it('too short: protrusion 21 → tip at −1, engagement 9 < 10', () => {
    expect(only(pilot(21), 'pilot.engagement').severity).toBe('error');
    expect(findings(pilot(21), 'pilot.bottoming')).toHaveLength(0);
  });
  it('bottoming: protrusion 35.5 → tip at −15.5, clearance 0.5 < 1', () => {
    expect(only(pilot(35.5), 'pilot.bottoming').severity).toBe('error');
  });
  it('in between: a note', () => {
    expect(only(pilot(28), 'pilot.engagement').severity).toBe('note');
    expect(findings(pilot(28), 'pilot.bottoming')).toHaveLength(0);
  });
  it('a pilot chain for another plate thickness is a warning', () => {
    expect(only(pilot(28, 19), 'stackUp.thicknessMismatch').severity).toBe('warning');
    expect(findings(pilot(28, 20), 'stackUp.thicknessMismatch')).toHaveLength(0);
  });
});

describe('release bearing (stack-up verdict)', () => {
  // bell face at 20; friction face at 10 + 40 = 50; fingers engaged at 50 + 30 = 80, disengaged at 72;
  // bearing at rest at 20 + 62 = 82 → clearance 2, stroke to disengage 10
  const bearing = (availableTravelMm: number) =>
    plate((s) => {
      s.stackUp = {
        releaseBearing: {
          plateThicknessMm: { nominalMm: 20 },
          crankFlangePositionMm: { nominalMm: 10 },
          flywheelDepthMm: { nominalMm: 40 },
          fingersEngagedFromFrictionFaceMm: { nominalMm: 30 },
          fingersDisengagedFromFrictionFaceMm: { nominalMm: 22 },
          bearingRestFromBellFaceMm: { nominalMm: 62 },
          availableTravelMm,
        },
      };
    });
  it('enough stroke: a note; too little: an error', () => {
    expect(only(bearing(12), 'clutch.releaseBearing').severity).toBe('note');
    expect(only(bearing(8), 'clutch.releaseBearing').severity).toBe('error');
  });
});

describe('bolt holes near a bore edge and nuts under a flange', () => {
  it('a bolt hole within 1.2·d0 of the centre bore edge is noted (EN 1993-1-8 e ≥ 1.2·d0)', () => {
    // T holes (M8, d0 8) at r = 75: a Ø136 bore leaves 7 mm < 9.6 mm; Ø130 leaves 10 mm
    expect(only(plate((s) => (s.centreBore.diameterMm = 136)), 'layout.boreEdge', 'T1').severity).toBe('note');
    expect(findings(plate((s) => (s.centreBore.diameterMm = 130)), 'layout.boreEdge')).toHaveLength(0);
  });
  it('a stud nut under the other flange asks for an explicit counterbore', () => {
    const studs = (counterbore?: object) =>
      plate((s) => {
        s.transmissionFace.patterns[0] = { id: 'TB', diameterMm: 260, count: 4, startAngleDeg: 0 };
        s.engineFace.holes[0] = { id: 'E1', patternId: 'EB', index: 0, role: 'stud', fastener: 'M10', ...(counterbore ? { counterbore } : {}) };
      });
    expect(only(studs(), 'counterbore.unchecked', 'E1').severity).toBe('warning');
    expect(findings(studs({ diameterMm: 20, depthMm: 9 }), 'counterbore.unchecked', 'E1')).toHaveLength(0);
  });
});

describe('every finding names its rule and source, errors first', () => {
  it('holds on a plate with many problems', () => {
    const bad = plate((s) => {
      s.outline.edgeMarginMm = 5;
      s.transmissionFace.holes[0].threadDepthMm = 10;
      s.transmissionFace.holes.pop();
    });
    const all = checkPlate(bad);
    expect(countFindings(all).error).toBeGreaterThan(0);
    const order = all.map((f) => ({ error: 0, warning: 1, note: 2 })[f.severity]);
    expect([...order].sort((a, b) => a - b)).toEqual(order);
    for (const f of all) {
      expect(f.rule).not.toBe('');
      expect(f.source).not.toBe('');
    }
  });
});

describe('layoutIsDisjoint (the gate for the direct solid build)', () => {
  it('a clean layout is disjoint; a nose bore inside its recess is fine', () => {
    expect(layoutIsDisjoint(plateProfile(plate()))).toBe(true);
    const withRecess = plate((s) => (s.starter = { ...starterInput(), recess: { depthMm: 3, shape: { kind: 'circle', diameterMm: 70 } } }));
    expect(layoutProblems(plateProfile(withRecess))).toEqual([]);
  });
  it('overlapping holes, a hole across a pocket edge or a through-deep counterbore are not', () => {
    const overlapping = plate((s) => (s.transmissionFace.patterns[0] = { id: 'TB', diameterMm: 200, count: 4, startAngleDeg: 45 }));
    expect(layoutIsDisjoint(plateProfile(overlapping))).toBe(false);
    const crossing = plate((s) => {
      const st = starterInput();
      st.mountingHoles[0].tangentialMm = 36;
      s.starter = { ...st, recess: { depthMm: 3, shape: { kind: 'circle', diameterMm: 70 } } };
    });
    expect(layoutProblems(plateProfile(crossing))).toContain('SM1 crosses the edge of pocket P1');
    const deep = plate((s) => (s.engineFace.holes[0].counterbore = { depthMm: 19.5 }));
    expect(layoutIsDisjoint(plateProfile(deep))).toBe(false);
    const closeToEdge = plate((s) => (s.outline = { kind: 'auto', edgeMarginMm: 0.5, cornerRadiusMm: 0 }));
    expect(layoutIsDisjoint(plateProfile(closeToEdge))).toBe(false);
  });
});
