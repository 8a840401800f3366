/**
 * Fastener and thread designations: ISO metric (`M10`, `M10x1.25`) and unified inch
 * (`3/8-16 UNC`, `1/2-20 UNF`, `#10-24`).
 *
 * Conventions (decided here, used by every table that takes a fastener text):
 * - A metric size without a pitch is the coarse pitch — that is how ISO 965-1 designates coarse
 *   threads — so `M10` parses to M10x1.5 (series 'coarse').
 * - A unified size without threads-per-inch (`3/8`) names the bolt size only: pitch, tpi and
 *   series are null. That is enough for clearance holes and cap screw heads; tapped holes need
 *   the pitch (`3/8-16`, or `3/8 UNC`).
 * - A series given with a pitch must agree with it (`3/8-24 UNC` is rejected).
 *
 * Sizes and pitches: ISO 261 coarse pitches and a selection of its fine pitches (M3–M24);
 * ASME B1.1 UNC/UNF pitches (#4 to 1 in). Tables from memory of those standards.
 */
import { DomainError } from '../errors';
import { describeValue, MM_PER_IN } from '../units';

export type ThreadSystem = 'metric' | 'unified';
export type ThreadSeries = 'coarse' | 'fine';

export interface Fastener {
  readonly system: ThreadSystem;
  /** 'M10', '3/8', '#10' */
  readonly nominal: string;
  readonly nominalDiameterMm: number;
  readonly pitchMm: number | null;
  readonly tpi: number | null;
  readonly series: ThreadSeries | null;
  /** normalised: 'M10x1.5', '3/8-16 UNC', '#10-24 UNC', or the bare size '3/8' */
  readonly designation: string;
}

interface MetricSize {
  readonly diameterMm: number;
  readonly coarsePitchMm: number;
  readonly finePitchesMm: readonly number[];
}

/** ISO 261 coarse pitch and selected fine pitches (from memory). */
const METRIC_SIZES: readonly MetricSize[] = [
  { diameterMm: 3, coarsePitchMm: 0.5, finePitchesMm: [] },
  { diameterMm: 4, coarsePitchMm: 0.7, finePitchesMm: [] },
  { diameterMm: 5, coarsePitchMm: 0.8, finePitchesMm: [] },
  { diameterMm: 6, coarsePitchMm: 1, finePitchesMm: [0.75] },
  { diameterMm: 8, coarsePitchMm: 1.25, finePitchesMm: [1] },
  { diameterMm: 10, coarsePitchMm: 1.5, finePitchesMm: [1.25, 1] },
  { diameterMm: 12, coarsePitchMm: 1.75, finePitchesMm: [1.5, 1.25] },
  { diameterMm: 14, coarsePitchMm: 2, finePitchesMm: [1.5] },
  { diameterMm: 16, coarsePitchMm: 2, finePitchesMm: [1.5] },
  { diameterMm: 18, coarsePitchMm: 2.5, finePitchesMm: [2, 1.5] },
  { diameterMm: 20, coarsePitchMm: 2.5, finePitchesMm: [2, 1.5] },
  { diameterMm: 22, coarsePitchMm: 2.5, finePitchesMm: [1.5] },
  { diameterMm: 24, coarsePitchMm: 3, finePitchesMm: [2] },
];

interface UnifiedSize {
  readonly nominal: string;
  /** basic major diameter, inch */
  readonly diameterIn: number;
  readonly uncTpi: number;
  readonly unfTpi: number;
}

/** ASME B1.1 basic major diameters and UNC/UNF threads per inch (from memory). */
const UNIFIED_SIZES: readonly UnifiedSize[] = [
  { nominal: '#4', diameterIn: 0.112, uncTpi: 40, unfTpi: 48 },
  { nominal: '#6', diameterIn: 0.138, uncTpi: 32, unfTpi: 40 },
  { nominal: '#8', diameterIn: 0.164, uncTpi: 32, unfTpi: 36 },
  { nominal: '#10', diameterIn: 0.19, uncTpi: 24, unfTpi: 32 },
  { nominal: '1/4', diameterIn: 0.25, uncTpi: 20, unfTpi: 28 },
  { nominal: '5/16', diameterIn: 0.3125, uncTpi: 18, unfTpi: 24 },
  { nominal: '3/8', diameterIn: 0.375, uncTpi: 16, unfTpi: 24 },
  { nominal: '7/16', diameterIn: 0.4375, uncTpi: 14, unfTpi: 20 },
  { nominal: '1/2', diameterIn: 0.5, uncTpi: 13, unfTpi: 20 },
  { nominal: '9/16', diameterIn: 0.5625, uncTpi: 12, unfTpi: 18 },
  { nominal: '5/8', diameterIn: 0.625, uncTpi: 11, unfTpi: 18 },
  { nominal: '3/4', diameterIn: 0.75, uncTpi: 10, unfTpi: 16 },
  { nominal: '7/8', diameterIn: 0.875, uncTpi: 9, unfTpi: 14 },
  { nominal: '1', diameterIn: 1, uncTpi: 8, unfTpi: 12 },
];

const EXAMPLES = 'e.g. "M10", "M10x1.25", "3/8", "3/8-16 UNC", "1/2-20 UNF", "#10-24"';

const METRIC_RE = /^M\s*(\d+(?:\.\d+)?)(?:\s*[x×*]\s*(\d+(?:\.\d+)?))?$/i;
const UNIFIED_RE = /^(#\s*\d+|\d+\/\d+|\d+)\s*(?:"|in\b)?\s*(?:-\s*(\d+))?(?:\s*-?\s*(UNC|UNF))?$/i;

/** Pitch comparisons: pitches are tabulated to 0.05 mm, typed values may carry float noise. */
const PITCH_TOLERANCE_MM = 1e-6;

function unknown(text: string, why: string): DomainError {
  return new DomainError('fastener.unknown', `Unknown fastener "${text}": ${why} (${EXAMPLES}).`);
}

function metricDesignation(d: number, p: number): string {
  return `M${d}x${p}`;
}

function parseMetric(text: string, m: RegExpExecArray): Fastener {
  const d = Number(m[1]);
  const size = METRIC_SIZES.find((s) => Math.abs(s.diameterMm - d) < PITCH_TOLERANCE_MM);
  if (!size) {
    const known = METRIC_SIZES.map((s) => `M${s.diameterMm}`).join(', ');
    throw unknown(text, `M${d} is not a size in the table (known: ${known})`);
  }
  let pitch = size.coarsePitchMm;
  let series: ThreadSeries = 'coarse';
  if (m[2] !== undefined) {
    const p = Number(m[2]);
    if (Math.abs(p - size.coarsePitchMm) < PITCH_TOLERANCE_MM) {
      pitch = size.coarsePitchMm;
    } else {
      const fine = size.finePitchesMm.find((f) => Math.abs(f - p) < PITCH_TOLERANCE_MM);
      if (fine === undefined) {
        const fines = size.finePitchesMm.length > 0 ? `; fine ${size.finePitchesMm.join(', ')}` : '';
        throw unknown(
          text,
          `${p} mm is not a standard pitch for M${size.diameterMm} (coarse ${size.coarsePitchMm}${fines})`,
        );
      }
      pitch = fine;
      series = 'fine';
    }
  }
  return Object.freeze({
    system: 'metric',
    nominal: `M${size.diameterMm}`,
    nominalDiameterMm: size.diameterMm,
    pitchMm: pitch,
    tpi: null,
    series,
    designation: metricDesignation(size.diameterMm, pitch),
  });
}

function parseUnified(text: string, m: RegExpExecArray): Fastener {
  const nominal = m[1]!.replace(/\s+/g, '');
  const size = UNIFIED_SIZES.find((s) => s.nominal === nominal);
  if (!size) {
    const known = UNIFIED_SIZES.map((s) => s.nominal).join(', ');
    throw unknown(text, `${nominal} is not a unified size in the table (known: ${known})`);
  }
  const seriesToken = m[3]?.toUpperCase();
  let tpi: number | null = null;
  let series: ThreadSeries | null = null;
  if (m[2] !== undefined) {
    tpi = Number(m[2]);
    if (tpi === size.uncTpi) series = 'coarse';
    else if (tpi === size.unfTpi) series = 'fine';
    else {
      throw unknown(text, `${size.nominal} has ${size.uncTpi} threads per inch (UNC) or ${size.unfTpi} (UNF), not ${tpi}`);
    }
    if (seriesToken !== undefined) {
      const stated: ThreadSeries = seriesToken === 'UNC' ? 'coarse' : 'fine';
      if (stated !== series) {
        const right = series === 'coarse' ? 'UNC' : 'UNF';
        throw unknown(text, `${size.nominal}-${tpi} is ${right}, not ${seriesToken}`);
      }
    }
  } else if (seriesToken !== undefined) {
    series = seriesToken === 'UNC' ? 'coarse' : 'fine';
    tpi = series === 'coarse' ? size.uncTpi : size.unfTpi;
  }
  const designation = tpi === null ? size.nominal : `${size.nominal}-${tpi} ${series === 'coarse' ? 'UNC' : 'UNF'}`;
  return Object.freeze({
    system: 'unified',
    nominal: size.nominal,
    nominalDiameterMm: size.diameterIn * MM_PER_IN,
    pitchMm: tpi === null ? null : MM_PER_IN / tpi,
    tpi,
    series,
    designation,
  });
}

/**
 * Reads a fastener or thread designation.
 * @throws DomainError `fastener.unknown` with the reason and accepted forms
 */
export function parseFastener(text: string): Fastener {
  if (typeof text !== 'string') {
    throw new DomainError('fastener.unknown', `A fastener must be text such as "M10x1.5" or "3/8-16 UNC"; got ${describeValue(text)} (${EXAMPLES}).`);
  }
  if (text.trim() === '') throw unknown(text, 'the field is empty');
  const t = text.trim();
  const metric = METRIC_RE.exec(t);
  if (metric) return parseMetric(text, metric);
  const unified = UNIFIED_RE.exec(t);
  if (unified) return parseUnified(text, unified);
  throw unknown(text, 'not a metric (M…) or unified (fraction, #number) designation');
}

/** Same as parseFastener, but requires a pitch (tapped holes, minor diameters). */
export function parseThread(text: string): Fastener & { readonly pitchMm: number } {
  const f = parseFastener(text);
  if (f.pitchMm === null) {
    throw new DomainError(
      'thread.pitchMissing',
      `"${text}" names a bolt size but no thread: give the threads per inch or series, e.g. "${f.nominal}-${UNIFIED_SIZES.find((s) => s.nominal === f.nominal)?.uncTpi ?? ''} UNC".`,
    );
  }
  return f as Fastener & { readonly pitchMm: number };
}

/** All metric nominal sizes the parser knows, e.g. 'M10'. */
export const METRIC_NOMINALS: readonly string[] = Object.freeze(METRIC_SIZES.map((s) => `M${s.diameterMm}`));
/** All unified nominal sizes the parser knows, e.g. '3/8'. */
export const UNIFIED_NOMINALS: readonly string[] = Object.freeze(UNIFIED_SIZES.map((s) => s.nominal));
