import { describe, expect, it } from 'vitest';
import { DomainError } from '../../../src/domain/errors';
import { parsePlateSpec, plateSpecSchema, specIssues } from '../../../src/domain/spec';
import { baseInput } from './plateFixture';

/** The DomainError a bad spec throws. */
function rejection(input: unknown): DomainError {
  try {
    parsePlateSpec(input);
  } catch (e) {
    if (e instanceof DomainError) return e;
    throw e;
  }
  throw new Error('expected the spec to be rejected');
}

describe('plate spec schema', () => {
  it('parses a valid spec and fills the defaults a builder expects', () => {
    const input = baseInput();
    delete (input as Record<string, unknown>).outline;
    const spec = parsePlateSpec(input);
    expect(spec.displayUnits).toEqual({ length: 'mm', fractions: false });
    expect(spec.datum.origin).toBe('crankshaftAxis');
    expect(spec.outline).toEqual({ kind: 'auto', edgeMarginMm: 12, cornerRadiusMm: 10 });
    // 6061-T6 density 2.70 g/cm³, yield 276 MPa (Aluminum Association typical values, REFERENCES.md)
    expect(spec.material).toEqual({ name: '6061-T6', densityGPerCm3: 2.7, yieldMpa: 276, kind: 'aluminium' });
    // 0.005 in TIR commonly quoted for passenger-car bell housings (REFERENCES.md, common practice)
    expect(spec.tolerances.alignmentTirMm).toBeCloseTo(0.005 * 25.4, 12);
    expect(spec.engineFace.flangeFootprint).toEqual({ kind: 'hull', marginMm: 10 });
    expect(spec.engineFace.patterns[0]!.centerX).toBe(0);
    expect(spec.edgeChamferMm).toBe(0);
  });

  it('refuses lengths beyond 10 m with a message naming the field (areas and masses would overflow)', () => {
    const input = baseInput() as any;
    input.engineFace.patterns[0].diameterMm = 2.39e153;
    const e = rejection(input);
    expect(e.message).toMatch(/within ±10000 mm/);
    expect(e.message).toMatch(/engineFace\.patterns\.0\.diameterMm|diameterMm/);
    const below = baseInput() as any;
    below.engineFace.holes[4].x = -10_001;
    expect(rejection(below).message).toMatch(/within ±10000 mm/);
    // an ordinary length is still accepted
    const edge = baseInput() as any;
    edge.engineFace.patterns[0].diameterMm = 200;
    expect(() => parsePlateSpec(edge)).not.toThrow();
  });

  it('accepts the same document as JSON text', () => {
    const spec = parsePlateSpec(JSON.stringify(baseInput()));
    expect(spec.engineFace.holes).toHaveLength(6);
    expect(rejection('{"schemaVersion": 1,').code).toBe('spec.json');
  });

  it('rejects an unknown field with a message naming its path', () => {
    const input = baseInput() as any;
    input.engineFace.holes[3].colour = 'red';
    const e = rejection(input);
    expect(e.code).toBe('spec.invalid');
    expect(e.message).toContain('engineFace.holes.3.colour: unknown field "colour"');
    expect(e.path).toEqual(['engineFace', 'holes', 3, 'colour']);

    const top = baseInput() as any;
    top.thicknes = 12;
    expect(rejection(top).message).toContain('thicknes: unknown field');

    const nested = baseInput() as any;
    nested.outline.margin = 3;
    expect(rejection(nested).message).toContain('outline.margin: unknown field');
  });

  it('lists every problem as `path: message`', () => {
    const input = baseInput() as any;
    input.thicknessMm = -1;
    input.engineFace.holes[0].role = 'rivet';
    input.transmissionFace.holes[1].fastener = 'M8x3';
    const e = rejection(input);
    expect(e.message).toMatch(/3 problems/);
    expect(e.message).toContain('thicknessMm: must be greater than 0 mm');
    expect(e.message).toContain('engineFace.holes.0.role: must be "clearance", "tapped", "dowel" or "stud"');
    expect(e.message).toMatch(/transmissionFace\.holes\.1\.fastener: Unknown fastener "M8x3"/);
  });

  it('names a missing required field', () => {
    const input = baseInput() as any;
    delete input.engineFace.viewedFrom;
    expect(rejection(input).message).toContain('engineFace.viewedFrom: is required');
  });

  const bad: [string, (s: any) => void, RegExp][] = [
    ['pattern with both count and angles', (s) => (s.engineFace.patterns[0].anglesDeg = [0, 90]), /engineFace\.patterns\.0\.count: give either count/],
    ['hole with x but no y', (s) => (s.engineFace.holes[4] = { id: 'ED1', x: 10, role: 'dowel', dowel: { diameterMm: 8 } }), /engineFace\.holes\.4\.y: a hole placed by coordinates needs both/],
    ['hole placed both ways', (s) => (s.engineFace.holes[0].x = 5), /engineFace\.holes\.0\.patternId: place a hole either/],
    ['unknown pattern', (s) => (s.engineFace.holes[0].patternId = 'XX'), /engineFace\.holes\.0\.patternId: no pattern "XX" on this face \(patterns: "EB"\)/],
    ['index past the pattern', (s) => (s.engineFace.holes[0].index = 4), /engineFace\.holes\.0\.index: pattern "EB" has 4 holes, so index runs 0 to 3; got 4/],
    ['two holes in one slot', (s) => (s.engineFace.holes[1].index = 0), /engineFace\.holes\.1\.index: slot 0 of pattern "EB" is already taken by holes\.0/],
    ['ids repeated across faces', (s) => (s.transmissionFace.holes[0].id = 'E1'), /transmissionFace\.holes\.0\.id: id "E1" is already used by engineFace\.holes\.0\.id/],
    ['a reserved id', (s) => (s.engineFace.holes[0].id = 'C1'), /engineFace\.holes\.0\.id: id "C1" is reserved/],
    ['a dowel with a fastener', (s) => (s.engineFace.holes[4].fastener = 'M8'), /engineFace\.holes\.4\.fastener: a dowel hole takes no fastener/],
    ['an unknown dowel fit', (s) => (s.engineFace.holes[4].dowel.fit = 'Z7'), /engineFace\.holes\.4\.dowel\.fit: Tolerance class "Z7"/],
    ['a clearance hole without fastener', (s) => delete s.engineFace.holes[0].fastener, /engineFace\.holes\.0\.fastener: a clearance hole needs a fastener/],
    ['a tapped hole with a bolt size only', (s) => (s.transmissionFace.holes[0].fastener = '3/8'), /transmissionFace\.holes\.0\.fastener: .*names a bolt size but no thread/],
    ['thread deeper than its blind hole', (s) => Object.assign(s.transmissionFace.holes[0], { depthMm: 10, threadDepthMm: 12 }), /threadDepthMm 12 mm is deeper than the hole/],
    ['a blind clearance hole', (s) => (s.engineFace.holes[0].depthMm = 5), /engineFace\.holes\.0\.depthMm: a clearance hole goes through the plate/],
    ['a register without fit', (s) => (s.centreBore = { kind: 'register', diameterMm: 100 }), /centreBore\.fit: a register locates/],
    ['an unknown outline kind', (s) => (s.outline = { kind: 'star' }), /outline\.kind: kind must be "auto" or "polygon"/],
    ['a chamfer eating the edge', (s) => (s.edgeChamferMm = 10), /edgeChamferMm: edgeChamferMm 10 mm on both edges leaves no straight edge/],
    ['a wrong schema version', (s) => (s.schemaVersion = 2), /schemaVersion: must be 1/],
    ['a ring gear with module and pitch', (s) => (s.starter = { ringGear: { teeth: 100, moduleMm: 2.5, diametralPitch: 10 }, pinion: { teeth: 10 }, angleDeg: 0, noseBoreDiameterMm: 50 }), /starter\.ringGear\.moduleMm: give either moduleMm/],
  ];
  for (const [what, change, message] of bad) {
    it(`rejects ${what}`, () => {
      const input = baseInput();
      change(input);
      const e = rejection(input);
      expect(e.code).toBe('spec.invalid');
      expect(e.message).toMatch(message);
    });
  }

  it('specIssues gives one entry per field for form resolvers', () => {
    const input = baseInput() as any;
    input.engineFace.holes[2].colour = 'red';
    input.engineFace.holes[2].size = 3;
    const r = plateSpecSchema.safeParse(input);
    expect(r.success).toBe(false);
    const issues = specIssues(r.error!);
    expect(issues.map((i) => i.path)).toEqual(['engineFace.holes.2.colour', 'engineFace.holes.2.size']);
  });
});
