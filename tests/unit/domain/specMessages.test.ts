/**
 * The plate spec and stack-up schemas are written with zod/mini, which loads no message language
 * by itself. These tests pin what a builder reads: zod's own English wording where the spec does
 * not word a message itself, each issue on its field, and the defaults a parse fills in.
 * The English wording is zod's English locale (zod/v4/locales/en.js), which classic zod printed.
 */
import { afterEach, describe, expect, it, vi } from 'vitest';
import { z } from 'zod/mini';
import { baseInput } from './plateFixture';

type SpecModule = typeof import('../../../src/domain/spec');
type StackUpModule = typeof import('../../../src/domain/stackUp');

/** Loads a module afresh with no message language chosen yet, as a browser page starts. */
async function freshly<T>(path: string): Promise<T> {
  z.core.globalConfig.localeError = undefined;
  vi.resetModules();
  return (await import(path)) as T;
}

afterEach(() => {
  // leave a language in place for the other tests of this worker
  if (!z.core.globalConfig.localeError) z.config(z.locales.en());
});

/** The DomainError `fn` throws (by its code: a module loaded afresh has its own DomainError class). */
function rejection(fn: () => unknown): Error & { code: string; path?: unknown } {
  try {
    fn();
  } catch (e) {
    if (e instanceof Error && typeof (e as { code?: unknown }).code === 'string') return e as Error & { code: string };
    throw e;
  }
  throw new Error('expected a DomainError');
}

describe('messages zod words itself stay English', () => {
  it('the plate spec sets the English messages when it is the first to load zod', async () => {
    const { parsePlateSpec } = await freshly<SpecModule>('../../../src/domain/spec');
    const input = baseInput() as any;
    input.displayUnits = { fractions: 'yes' };
    input.partLabel = '   ';
    input.transmissionFace.patterns[1].anglesDeg = Array.from({ length: 361 }, (_, i) => i);
    input.material = { name: 'x'.repeat(61), densityGPerCm3: 30, kind: 'aluminium' };
    input.notes = 'x'.repeat(4001);
    const e = rejection(() => parsePlateSpec(input));
    expect(e.code).toBe('spec.invalid');
    expect(e.message.split('\n').slice(1)).toEqual([
      'displayUnits.fractions: Invalid input: expected boolean, received string',
      'partLabel: Too small: expected string to have >=1 characters',
      'transmissionFace.patterns.1.anglesDeg: Too big: expected array to have <=360 items',
      'material.name: Too big: expected string to have <=60 characters',
      'material.densityGPerCm3: Too big: expected number to be <=25',
      'notes: Too big: expected string to have <=4000 characters',
    ]);
    expect(z.core.globalConfig.localeError).toBeTypeOf('function');
  });

  it('the stack-up alone sets them too, in its own error text', async () => {
    const { evaluateStackUps } = await freshly<StackUpModule>('../../../src/domain/stackUp');
    const tl = (nominalMm: number) => ({ nominalMm });
    const e = rejection(() =>
      evaluateStackUps({
        pilot: {
          plateThicknessMm: tl(20),
          pilotBearingRearFaceMm: tl(30),
          pilotBoreBottomMm: { nominalMm: 5, plusMm: -0.1 },
          pilotProtrusionMm: tl(10),
          minimumEngagementMm: -1,
          colour: 'red',
        } as never,
      }),
    );
    expect(e.code).toBe('stackUp.invalid');
    expect(e.message).toBe(
      'Stack-up inputs are not valid — pilot.pilotBoreBottomMm.plusMm: Too small: expected number to be >=0; ' +
        'pilot.minimumEngagementMm: Too small: expected number to be >=0; pilot: Unrecognized key: "colour"',
    );
    expect(e.path).toEqual(['pilot', 'pilotBoreBottomMm', 'plusMm']);
  });

  it('a language the app chose first is kept', async () => {
    z.config({ localeError: () => 'chosen by the app' });
    vi.resetModules();
    const { plateSpecSchema } = (await import('../../../src/domain/spec')) as SpecModule;
    const input = baseInput() as any;
    input.material = { name: '6061-T6', densityGPerCm3: 30, kind: 'aluminium' };
    const r = plateSpecSchema.safeParse(input);
    expect(r.error?.issues.map((i) => [i.path.join('.'), i.message])).toEqual([['material.densityGPerCm3', 'chosen by the app']]);
    z.core.globalConfig.localeError = undefined;
  });
});

describe('refused specs: each issue on its field', () => {
  it('refinements of nested objects keep their paths and messages', async () => {
    const { plateSpecSchema, specIssues } = await import('../../../src/domain/spec');
    const input = baseInput() as any;
    input.centreBore = { kind: 'bore', diameterMm: 90, limitsMm: { lowerMm: 90.1, upperMm: 90 } };
    input.starter = {
      ringGear: { teeth: 100, moduleMm: 2.5 },
      pinion: { teeth: 10 },
      angleDeg: 0,
      noseBoreDiameterMm: 50,
      recess: { depthMm: 3, shape: { kind: 'slot', widthMm: 20, lengthMm: 10 } },
      mountingHoles: [{ id: 'E1', role: 'tapped', fastener: 'M10', radialMm: 40, tangentialMm: 0 }],
    };
    input.outline = { kind: 'polygon', points: [{ x: 0, y: 0 }, { x: 1, y: 0 }] };
    const r = plateSpecSchema.safeParse(input);
    expect(r.success).toBe(false);
    expect(specIssues(r.error!).map((i) => [i.pathSegments, i.message])).toEqual([
      [['centreBore', 'limitsMm', 'upperMm'], 'upperMm must not be below lowerMm'],
      [['starter', 'recess', 'shape', 'lengthMm'], 'lengthMm must be at least widthMm'],
      [['outline', 'points'], 'needs at least 3 corners'],
      [['starter', 'mountingHoles', 0, 'id'], 'id "E1" is already used by engineFace.holes.0.id; feature ids are unique over the plate'],
    ]);
  });

  it('a wrong discriminator is reported on the kind', async () => {
    const { plateSpecSchema, specIssues } = await import('../../../src/domain/spec');
    const input = baseInput() as any;
    input.engineFace.flangeFootprint = { kind: 'circle' };
    const r = plateSpecSchema.safeParse(input);
    expect(specIssues(r.error!).map((i) => [i.path, i.message])).toEqual([['engineFace.flangeFootprint.kind', 'kind must be "hull" or "polygon"']]);
  });
});

describe('defaults a parse fills in', () => {
  it('fills nested defaults of holes, starter, outline and tolerances', async () => {
    const { parsePlateSpec } = await import('../../../src/domain/spec');
    const input = baseInput() as any;
    input.engineFace.holes[4].dowel = { diameterMm: 8 };
    delete input.transmissionFace.patterns;
    delete input.transmissionFace.holes;
    input.transmissionFace.flangeFootprint = { kind: 'hull' };
    input.starter = { ringGear: { teeth: 100, moduleMm: 2.5 }, pinion: { teeth: 10 }, angleDeg: 0, noseBoreDiameterMm: 50 };
    input.outline = { kind: 'polygon', points: [{ x: -150, y: -150 }, { x: 150, y: -150 }, { x: 0, y: 150 }] };
    input.tolerances = { flatnessMm: 0.02 };
    input.stackUp = { plateThickness: { crankFlangePositionMm: { nominalMm: 1 }, flywheelDepthMm: { nominalMm: 30, plusMm: 0.1 }, requiredBellFaceToFrictionFaceMm: { nominalMm: 12 } } };
    delete input.thicknessStock;
    const spec = parsePlateSpec(input);
    expect(spec.engineFace.holes[4]!.dowel).toEqual({ diameterMm: 8, fit: 'H7' });
    expect(spec.transmissionFace.patterns).toEqual([]);
    expect(spec.transmissionFace.holes).toEqual([]);
    expect(spec.transmissionFace.flangeFootprint).toEqual({ kind: 'hull', marginMm: 10 });
    expect(spec.engineFace.patterns[0]).toEqual({ id: 'EB', diameterMm: 200, count: 4, startAngleDeg: 45, centerX: 0, centerY: 0 });
    expect(spec.starter).toMatchObject({ side: 'engine', mountingHoles: [] });
    expect(spec.outline).toEqual({ kind: 'polygon', points: input.outline.points, cornerRadiusMm: 0 });
    // only the given tolerance changes; the others keep the spec's defaults (0.005 in TIR is 0.127 mm)
    expect(spec.tolerances).toEqual({ alignmentTirMm: 0.127, generalMm: 0.1, holePositionMm: 0.1, thicknessMm: 0.05, flatnessMm: 0.02 });
    expect(spec.stackUp?.plateThickness?.flywheelDepthMm).toEqual({ nominalMm: 30, plusMm: 0.1, minusMm: 0 });
    expect(spec.thicknessStock).toBe('any');
    expect(spec.datum).toEqual({ origin: 'crankshaftAxis' });
    // the key order of the parsed document is the schema's (the stored JSON and its hash depend on it)
    expect(Object.keys(spec).slice(0, 4)).toEqual(['schemaVersion', 'displayUnits', 'datum', 'partLabel']);
  });

  it('the stack-up fills a missing tolerance band with 0 on both sides', async () => {
    const { plateThicknessStackUp } = await import('../../../src/domain/stackUp');
    const v = plateThicknessStackUp({ crankFlangePositionMm: { nominalMm: 1 }, flywheelDepthMm: { nominalMm: 30, plusMm: 0.1 }, requiredBellFaceToFrictionFaceMm: { nominalMm: 12 } });
    expect(v.chain.map((d) => [d.plusMm, d.minusMm])).toEqual([
      [0, 0],
      [0.1, 0],
      [0, 0],
    ]);
    // 1 + 30 − 12 = 19 mm
    expect(v.result.nominalMm).toBeCloseTo(19, 12);
  });
});
