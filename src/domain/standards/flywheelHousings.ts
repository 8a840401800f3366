/**
 * SAE J617 flywheel housing sizes: housing bore (pilot), bolt circle, hole count and thread,
 * and the crank-flange-to-housing-face depth. Tabulated in inch, returned in mm.
 *
 * Hole positions: the holes straddle the vertical centreline — the first hole is half a pitch
 * off vertical (8 holes: 22.5°, 12 holes: 15°, 16 holes: 11.25°), just right of top, at
 * 90° − pitch/2; the others follow counter-clockwise. Angles are measured counter-clockwise from
 * +X in plate coordinates (origin on the crank axis, +Y up), each normalised to [0, 360). Every
 * pattern here has an even count per half, so it is symmetric about both the vertical and the
 * horizontal centreline.
 *
 * Bore/face runout limits (max TIR by housing bore) are the SAE housing alignment values.
 */
import { DomainError } from '../errors';
import { MM_PER_IN } from '../units';
import { parseFastener } from './threads';

export type FlywheelHousingSize = '00' | '0' | '1/2' | '1' | '2' | '3' | '4' | '5' | '6';

export const FLYWHEEL_HOUSING_SIZES: readonly FlywheelHousingSize[] = Object.freeze([
  '00',
  '0',
  '1/2',
  '1',
  '2',
  '3',
  '4',
  '5',
  '6',
]);

export interface FlywheelHousing {
  readonly size: FlywheelHousingSize;
  /** housing bore (pilot), lower limit */
  readonly boreMm: number;
  /** housing bore, upper limit */
  readonly boreUpperMm: number;
  readonly boltCircleDiameterMm: number;
  readonly holeCount: number;
  /** normalised thread designation of the housing holes, e.g. '3/8-16 UNC' */
  readonly thread: string;
  /** CCW from +X, each in [0, 360): the first at 90° − pitch/2, then counter-clockwise */
  readonly holeAnglesDeg: readonly number[];
  /** angle of the first hole (90° − pitch/2), for `boltCircle({ count, startAngleDeg })` */
  readonly startAngleDeg: number;
  readonly crankFlangeToHousingFaceMm: number;
  /** bore and face runout limit, total indicator reading */
  readonly maxRunoutTirMm: number;
}

interface Row {
  readonly boreIn: number;
  readonly boreUpperIn: number;
  readonly boltCircleIn: number;
  readonly holes: number;
  readonly thread: string;
  readonly depthIn: number;
}

const DEPTH_LARGE_IN = 3 + 15 / 16;
const DEPTH_SMALL_IN = 2 + 13 / 16;

const J617: Readonly<Record<FlywheelHousingSize, Row>> = Object.freeze({
  '00': { boreIn: 31.0, boreUpperIn: 31.01, boltCircleIn: 33.5, holes: 16, thread: '1/2-13', depthIn: DEPTH_LARGE_IN },
  '0': { boreIn: 25.5, boreUpperIn: 25.51, boltCircleIn: 26.75, holes: 16, thread: '1/2-13', depthIn: DEPTH_LARGE_IN },
  '1/2': { boreIn: 23.0, boreUpperIn: 23.008, boltCircleIn: 24.375, holes: 12, thread: '1/2-13', depthIn: DEPTH_LARGE_IN },
  '1': { boreIn: 20.125, boreUpperIn: 20.13, boltCircleIn: 20.875, holes: 12, thread: '7/16-14', depthIn: DEPTH_LARGE_IN },
  '2': { boreIn: 17.625, boreUpperIn: 17.63, boltCircleIn: 18.375, holes: 12, thread: '3/8-16', depthIn: DEPTH_LARGE_IN },
  '3': { boreIn: 16.125, boreUpperIn: 16.13, boltCircleIn: 16.875, holes: 12, thread: '3/8-16', depthIn: DEPTH_LARGE_IN },
  '4': { boreIn: 14.25, boreUpperIn: 14.255, boltCircleIn: 15.0, holes: 12, thread: '3/8-16', depthIn: DEPTH_LARGE_IN },
  '5': { boreIn: 12.375, boreUpperIn: 12.38, boltCircleIn: 13.125, holes: 8, thread: '3/8-16', depthIn: DEPTH_SMALL_IN },
  '6': { boreIn: 10.5, boreUpperIn: 10.505, boltCircleIn: 11.25, holes: 8, thread: '3/8-16', depthIn: DEPTH_SMALL_IN },
});

/** Max TIR (inch) by housing bore (inch), "up to and including". */
const RUNOUT_TIR_IN: readonly { readonly boreUpToIn: number; readonly tirIn: number }[] = [
  { boreUpToIn: 14.25, tirIn: 0.006 },
  { boreUpToIn: 20.125, tirIn: 0.008 },
  { boreUpToIn: 25.5, tirIn: 0.01 },
  { boreUpToIn: 31, tirIn: 0.012 },
];

/** Holes straddling the vertical: the first at 90° − pitch/2, then every pitch CCW; each in [0, 360). */
export function straddlingHoleAnglesDeg(count: number): number[] {
  const pitch = 360 / count;
  const angles: number[] = [];
  for (let k = 0; k < count; k++) {
    angles.push((((90 - pitch / 2 + k * pitch) % 360) + 360) % 360);
  }
  return angles;
}

export function flywheelHousing(size: FlywheelHousingSize): FlywheelHousing {
  const row = (J617 as Record<string, Row | undefined>)[size as string];
  if (!row) {
    throw new DomainError(
      'flywheelHousing.size',
      `Unknown flywheel housing size "${String(size)}": use one of ${FLYWHEEL_HOUSING_SIZES.join(', ')}.`,
    );
  }
  const tir = RUNOUT_TIR_IN.find((r) => row.boreIn <= r.boreUpToIn + 1e-9)!;
  return Object.freeze({
    size,
    boreMm: row.boreIn * MM_PER_IN,
    boreUpperMm: row.boreUpperIn * MM_PER_IN,
    boltCircleDiameterMm: row.boltCircleIn * MM_PER_IN,
    holeCount: row.holes,
    thread: parseFastener(row.thread + ' UNC').designation,
    holeAnglesDeg: Object.freeze(straddlingHoleAnglesDeg(row.holes)),
    startAngleDeg: 90 - 180 / row.holes,
    crankFlangeToHousingFaceMm: row.depthIn * MM_PER_IN,
    maxRunoutTirMm: tir.tirIn * MM_PER_IN,
  });
}
