/**
 * Writes the starting plate specs in templates/plates/: the blank plate, the demo plate and one
 * transmission-face start per SAE J617 flywheel housing size. Run: `npx tsx scripts/make-templates.ts`.
 * Every file is checked with the plate spec schema before it is written.
 */
import { writeFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { FLYWHEEL_HOUSING_SIZES, flywheelHousing, type FlywheelHousingSize } from '../src/domain/standards/flywheelHousings';
import { parsePlateSpec, type PlateSpecInput } from '../src/domain/spec';

const dir = fileURLToPath(new URL('../templates/plates/', import.meta.url));

function write(name: string, spec: PlateSpecInput): void {
  parsePlateSpec(spec);
  writeFileSync(`${dir}${name}`, `${JSON.stringify(spec, null, 2)}\n`);
  console.log(`templates/plates/${name}`);
}

const blank: PlateSpecInput = {
  schemaVersion: 1,
  engineFace: { viewedFrom: 'rear', holes: [] },
  transmissionFace: { viewedFrom: 'front', holes: [] },
  centreBore: { kind: 'bore', diameterMm: 90 },
  thicknessMm: 12.7,
};

/** Angles on the plate (seen from the rear) → as measured looking at the bell housing face. */
const measuredFromFront = (plateAnglesDeg: number[]): number[] => plateAnglesDeg.map((a) => (((180 - a) % 360) + 360) % 360);

const engineBolts = [5, 45, 85, 125, 165, 205, 245, 345];
const transmissionBoltsOnPlate = [10, 48, 90, 130, 168, 215, 240];
const transmissionDowelsOnPlate = [70, 190];

const demo: PlateSpecInput = {
  schemaVersion: 1,
  displayUnits: { length: 'mm', fractions: false },
  datum: { origin: 'crankshaftAxis', note: 'Origin on the crank axis, plate seen from the rear.' },
  partLabel: 'PW-DEMO-01',
  engineFace: {
    viewedFrom: 'rear',
    description: 'Invented H4 2.3 L inline-four (demo), rear face of the block',
    patterns: [
      { id: 'EB', diameterMm: 240, anglesDeg: engineBolts, note: 'block bolt holes, tapped M8 in the block' },
      { id: 'ED', diameterMm: 240, anglesDeg: [25, 185], note: 'block dowels' },
    ],
    holes: [
      ...engineBolts.map((_, i) => ({
        id: `E${i + 1}`,
        patternId: 'EB',
        index: i,
        role: 'clearance' as const,
        fastener: 'M8x1.25',
        clearanceClass: 'medium' as const,
        counterbore: {},
      })),
      { id: 'ED1', patternId: 'ED', index: 0, role: 'dowel', dowel: { diameterMm: 10, fit: 'H7' } },
      { id: 'ED2', patternId: 'ED', index: 1, role: 'dowel', dowel: { diameterMm: 10, fit: 'H7' } },
    ],
  },
  transmissionFace: {
    viewedFrom: 'front',
    description: 'Invented C5 five-speed gearbox (demo), bell housing face measured looking at it',
    patterns: [
      {
        id: 'TB',
        diameterMm: 290,
        anglesDeg: measuredFromFront(transmissionBoltsOnPlate),
        fitted: { centerX: 0.03, centerY: -0.02, rmsMm: 0.02, fromUploadId: 'demo-probe-1' },
        note: 'bell housing bolt holes, tapped M10 in the housing',
      },
      { id: 'TD', diameterMm: 290, anglesDeg: measuredFromFront(transmissionDowelsOnPlate), note: 'bell housing dowels' },
    ],
    holes: [
      ...transmissionBoltsOnPlate.map((_, i) => ({
        id: `T${i + 1}`,
        patternId: 'TB',
        index: i,
        role: 'clearance' as const,
        fastener: 'M10x1.5',
        clearanceClass: 'medium' as const,
      })),
      { id: 'TD1', patternId: 'TD', index: 0, role: 'dowel', dowel: { diameterMm: 12, fit: 'H7' } },
      { id: 'TD2', patternId: 'TD', index: 1, role: 'dowel', dowel: { diameterMm: 12, fit: 'H7' } },
    ],
  },
  centreBore: { kind: 'bore', diameterMm: 90, note: 'clearance for the crank flange and rear seal' },
  starter: {
    side: 'engine',
    ringGear: { teeth: 105, diametralPitch: 12 },
    pinion: { teeth: 10 },
    angleDeg: 300,
    noseBoreDiameterMm: 60,
    noseFit: 'H8',
    mountingHoles: [
      { id: 'SM1', role: 'clearance', fastener: 'M10x1.5', radialMm: 0, tangentialMm: 48 },
      { id: 'SM2', role: 'clearance', fastener: 'M10x1.5', radialMm: 0, tangentialMm: -48 },
    ],
    recess: { depthMm: 3, side: 'engine', shape: { kind: 'circle', diameterMm: 76 } },
  },
  thicknessMm: 12.7,
  thicknessStock: 'inch',
  stackUp: {
    plateThickness: {
      crankFlangePositionMm: { nominalMm: 8.0, plusMm: 0.1, minusMm: 0.1 },
      flywheelDepthMm: { nominalMm: 38.5, plusMm: 0.1, minusMm: 0.1 },
      requiredBellFaceToFrictionFaceMm: { nominalMm: 33.8, plusMm: 0.15, minusMm: 0.15 },
    },
    pilot: {
      plateThicknessMm: { nominalMm: 12.7, plusMm: 0.05, minusMm: 0.05 },
      pilotBearingRearFaceMm: { nominalMm: 8.0, plusMm: 0.2, minusMm: 0.2 },
      pilotBoreBottomMm: { nominalMm: -16.0, plusMm: 0.3, minusMm: 0.3 },
      pilotProtrusionMm: { nominalMm: 20.0, plusMm: 0.3, minusMm: 0.3 },
      minimumEngagementMm: 10,
      minimumBottomClearanceMm: 2,
    },
  },
  outline: { kind: 'auto', edgeMarginMm: 12, cornerRadiusMm: 10 },
  edgeChamferMm: 1,
  material: { name: '6061-T6', densityGPerCm3: 2.7, yieldMpa: 276, kind: 'aluminium' },
  tolerances: { alignmentTirMm: 0.127, generalMm: 0.1, holePositionMm: 0.1, thicknessMm: 0.05, flatnessMm: 0.05 },
  notes: 'Demo plate with invented data. Not a real engine or gearbox.',
};

function j617(size: FlywheelHousingSize): PlateSpecInput {
  const h = flywheelHousing(size);
  const pitch = 360 / h.holeCount;
  const large = h.thread.startsWith('1/2') || h.thread.startsWith('7/16');
  return {
    schemaVersion: 1,
    displayUnits: { length: 'in', fractions: true },
    partLabel: `SAE-${size.replace('/', '-')}`,
    engineFace: { viewedFrom: 'rear', holes: [] },
    transmissionFace: {
      viewedFrom: 'front',
      description: `SAE J617 size ${size} housing face: ${h.holeCount} × ${h.thread} on Ø${(h.boltCircleDiameterMm / 25.4).toFixed(3)} in`,
      patterns: [{ id: 'SAE', diameterMm: h.boltCircleDiameterMm, count: h.holeCount, startAngleDeg: 90 - pitch / 2 }],
      holes: Array.from({ length: h.holeCount }, (_, i) => ({
        id: `T${i + 1}`,
        patternId: 'SAE',
        index: i,
        role: 'tapped' as const,
        fastener: h.thread,
      })),
    },
    centreBore: {
      kind: 'register',
      diameterMm: h.boreMm,
      limitsMm: { lowerMm: h.boreMm, upperMm: h.boreUpperMm },
      note: `SAE J617 size ${size} housing bore (pilot)`,
    },
    thicknessMm: large ? 25.4 : 19.05,
    thicknessStock: 'inch',
    // keeps 1.5·D from the hole centre to the edge (EN 1993-1-8 recommended edge distance)
    outline: { kind: 'auto', edgeMarginMm: large ? 16 : 12, cornerRadiusMm: 10 },
    tolerances: { alignmentTirMm: h.maxRunoutTirMm },
  };
}

write('blank.json', blank);
write('demo.json', demo);
for (const size of FLYWHEEL_HOUSING_SIZES) write(`sae-j617-${size.replace('/', '-')}.json`, j617(size));
