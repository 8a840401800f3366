/**
 * A small invented plate that passes every check, for tests that change one value at a time.
 *
 * Engine face (plate coordinates): 4 clearance holes M10 on Ø200 at 45°, 135°, 225°, 315°
 * (E1–E4), dowels Ø8 at 0° and 180° on Ø200 (ED1, ED2).
 * Transmission face (measured from the front): 4 tapped holes M8x1.25 on Ø150 at 0°, 90°, 180°,
 * 270° (T1–T4), dowels Ø8 at 45° and 225° on Ø150 (TD1, TD2).
 * Centre bore Ø90, 20 mm plate, automatic outline with 12 mm margin.
 */
import { parsePlateSpec, type PlateSpec, type PlateSpecInput } from '../../../src/domain/spec';

export function baseInput(): PlateSpecInput {
  return {
    schemaVersion: 1,
    partLabel: 'TEST-1',
    engineFace: {
      viewedFrom: 'rear',
      patterns: [{ id: 'EB', diameterMm: 200, count: 4, startAngleDeg: 45 }],
      holes: [
        { id: 'E1', patternId: 'EB', index: 0, role: 'clearance', fastener: 'M10x1.5' },
        { id: 'E2', patternId: 'EB', index: 1, role: 'clearance', fastener: 'M10x1.5' },
        { id: 'E3', patternId: 'EB', index: 2, role: 'clearance', fastener: 'M10x1.5' },
        { id: 'E4', patternId: 'EB', index: 3, role: 'clearance', fastener: 'M10x1.5' },
        { id: 'ED1', x: 100, y: 0, role: 'dowel', dowel: { diameterMm: 8, fit: 'H7' } },
        { id: 'ED2', x: -100, y: 0, role: 'dowel', dowel: { diameterMm: 8, fit: 'H7' } },
      ],
    },
    transmissionFace: {
      viewedFrom: 'front',
      patterns: [
        { id: 'TB', diameterMm: 150, count: 4, startAngleDeg: 0 },
        { id: 'TD', diameterMm: 150, anglesDeg: [45, 225] },
      ],
      holes: [
        { id: 'T1', patternId: 'TB', index: 0, role: 'tapped', fastener: 'M8x1.25' },
        { id: 'T2', patternId: 'TB', index: 1, role: 'tapped', fastener: 'M8x1.25' },
        { id: 'T3', patternId: 'TB', index: 2, role: 'tapped', fastener: 'M8x1.25' },
        { id: 'T4', patternId: 'TB', index: 3, role: 'tapped', fastener: 'M8x1.25' },
        { id: 'TD1', patternId: 'TD', index: 0, role: 'dowel', dowel: { diameterMm: 8, fit: 'H7' } },
        { id: 'TD2', patternId: 'TD', index: 1, role: 'dowel', dowel: { diameterMm: 8, fit: 'H7' } },
      ],
    },
    centreBore: { kind: 'bore', diameterMm: 90 },
    thicknessMm: 20,
    thicknessStock: 'metric',
    outline: { kind: 'auto', edgeMarginMm: 12, cornerRadiusMm: 10 },
  };
}

/** The base plate with `change` applied to a deep copy of its input. */
// eslint-disable-next-line @typescript-eslint/no-explicit-any -- tests poke at any field, valid or not
export function plate(change: (s: any) => void = () => {}): PlateSpec {
  const input = structuredClone(baseInput());
  change(input);
  return parsePlateSpec(input);
}

/** A starter for the base plate: module 2.5, 100 + 10 teeth (a = 137.5 mm), at the bottom. */
export function starterInput(): Record<string, any> {
  return {
    side: 'engine',
    ringGear: { teeth: 100, moduleMm: 2.5 },
    pinion: { teeth: 10 },
    angleDeg: 270,
    noseBoreDiameterMm: 50,
    mountingHoles: [
      { id: 'SM1', role: 'tapped', fastener: 'M8x1.25', radialMm: 0, tangentialMm: 45 },
      { id: 'SM2', role: 'tapped', fastener: 'M8x1.25', radialMm: 0, tangentialMm: -45 },
    ],
  };
}
