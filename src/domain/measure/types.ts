/** What a measurement file parser gives back. */
import type { LengthUnit } from '../units';
import type { BoundingBox } from './pointBuffer';

export type MeasureFormat = 'xyz' | 'csv' | 'ply' | 'stl';
export const MEASURE_FORMATS: readonly MeasureFormat[] = Object.freeze(['xyz', 'csv', 'ply', 'stl']);

export interface ParsedCloud {
  readonly format: MeasureFormat;
  readonly encoding: 'ascii' | 'binary';
  /** points (unique vertices for a mesh) */
  readonly count: number;
  /** interleaved x, y, z in the file's units; null when parsed for a summary only */
  readonly points: Float64Array | null;
  readonly bbox: BoundingBox;
  /** distinct labels of a labelled point list, in order of first use */
  readonly labels: readonly string[];
  /** label of each point: 0 = none, k = labels[k − 1]; null without labels or points */
  readonly labelIndex: Uint16Array | null;
  /** triangles of an STL mesh */
  readonly triangleCount: number | null;
  /** header of a text file, as written */
  readonly columns: readonly string[] | null;
  /** a unit named in a header (`x [mm]`) */
  readonly unitsFromHeader: LengthUnit | null;
  readonly bytesRead: number;
}

export interface StreamParser {
  push(chunk: Uint8Array): void;
  /** Finishes the file: checks it is complete and returns what it holds. */
  end(): ParsedCloud;
  readonly bytesRead: number;
}
