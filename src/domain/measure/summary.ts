/** The summary kept with an upload: what the file holds, without its points. */
import type { LengthUnit } from '../units';
import type { BoundingBox } from './pointBuffer';
import type { MeasureFormat, ParsedCloud } from './types';
import { checkUnits, guessUnits, MM_SCALE, type UnitsCheck, type UnitsGuess } from './unitsHint';

export interface UploadSummary {
  readonly format: MeasureFormat;
  readonly encoding: 'ascii' | 'binary';
  readonly pointCount: number;
  readonly triangleCount: number | null;
  /** in the file's units */
  readonly bbox: BoundingBox;
  readonly bboxMm: BoundingBox;
  /** the units the builder chose for the file */
  readonly units: LengthUnit;
  readonly unitsGuess: UnitsGuess;
  readonly unitsCheck: UnitsCheck;
  readonly labels: readonly string[];
  readonly columns: readonly string[] | null;
}

function scaleBox(b: BoundingBox, k: number): BoundingBox {
  return { min: { x: b.min.x * k, y: b.min.y * k, z: b.min.z * k }, max: { x: b.max.x * k, y: b.max.y * k, z: b.max.z * k } };
}

export function uploadSummary(parsed: ParsedCloud, units: LengthUnit): UploadSummary {
  return {
    format: parsed.format,
    encoding: parsed.encoding,
    pointCount: parsed.count,
    triangleCount: parsed.triangleCount,
    bbox: parsed.bbox,
    bboxMm: scaleBox(parsed.bbox, MM_SCALE[units]),
    units,
    unitsGuess: guessUnits(parsed.bbox, parsed.unitsFromHeader),
    unitsCheck: checkUnits(parsed.bbox, units),
    labels: parsed.labels.slice(0, 200),
    columns: parsed.columns,
  };
}
