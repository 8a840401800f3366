/**
 * Where the parsers put points: one growing Float64Array of interleaved x, y, z (no per-point
 * objects), the bounding box, and optionally a label index per point. `keep: false` counts and
 * measures without storing (a summary of a large upload). `unique: true` drops exact repeats —
 * a triangle mesh lists each vertex once per triangle that uses it, and a fit must see it once.
 */
import { MeasureFileError } from './errors';

export interface BoundingBox {
  readonly min: { readonly x: number; readonly y: number; readonly z: number };
  readonly max: { readonly x: number; readonly y: number; readonly z: number };
}

export interface PointBufferOptions {
  readonly keep?: boolean;
  readonly unique?: boolean;
  readonly maxPoints?: number;
  /** expected number of points, to allocate once */
  readonly sizeHint?: number;
  /** what to say when maxPoints is passed */
  readonly where?: () => string;
}

export const DEFAULT_MAX_POINTS = 20_000_000;
/** Largest coordinate magnitude kept: beyond it a unit conversion or a fit's sum of squares overflows to Infinity. */
export const MAX_COORDINATE = 1e12;
const MAX_LABELS = 1000;

const scratch = new Float64Array(3);
const scratchBits = new Uint32Array(scratch.buffer);

export class PointBuffer {
  private data: Float64Array;
  private n = 0;
  private readonly keep: boolean;
  private readonly unique: boolean;
  readonly maxPoints: number;
  private readonly where: () => string;
  minX = Infinity;
  minY = Infinity;
  minZ = Infinity;
  maxX = -Infinity;
  maxY = -Infinity;
  maxZ = -Infinity;
  /** open-addressing table of point indices + 1 (0 = empty), for `unique` */
  private table: Int32Array = new Int32Array(0);
  private labelOf: Uint16Array | null = null;
  private readonly labelNames: string[] = [];
  private readonly labelIds = new Map<string, number>();
  /** points given, before repeats were dropped */
  given = 0;

  constructor(opts: PointBufferOptions = {}) {
    this.keep = opts.keep ?? true;
    this.unique = opts.unique ?? false;
    this.maxPoints = opts.maxPoints ?? DEFAULT_MAX_POINTS;
    this.where = opts.where ?? (() => '');
    const hint = Math.min(Math.max(opts.sizeHint ?? 4096, 16), this.maxPoints + 1);
    this.data = new Float64Array(this.keep || this.unique ? hint * 3 : 0);
    if (this.unique) this.table = new Int32Array(nextPow2(hint * 2));
  }

  get count(): number {
    return this.n;
  }

  /** Adds a point (already checked finite by the parser). Returns the point's index. */
  add(x: number, y: number, z: number): number {
    this.given++;
    if (this.unique) {
      const found = this.find(x, y, z);
      if (found >= 0) return found;
    }
    if (!(Math.abs(x) <= MAX_COORDINATE && Math.abs(y) <= MAX_COORDINATE && Math.abs(z) <= MAX_COORDINATE)) {
      const v = [x, y, z].find((c) => !(Math.abs(c) <= MAX_COORDINATE));
      throw new MeasureFileError(
        'measure.badNumber',
        `A coordinate of ${String(v)} is beyond ±${MAX_COORDINATE.toExponential(0)} in the file's units${this.where()}; a scan of a flange is never that large — check the file's units and columns.`,
      );
    }
    if (this.n >= this.maxPoints) {
      throw new MeasureFileError(
        'measure.tooManyPoints',
        `The file has more than ${this.maxPoints.toLocaleString('en-US')} points, the most one upload may hold${this.where()}. Thin the scan (every 2nd point, or a smaller region) and upload again.`,
      );
    }
    if (x < this.minX) this.minX = x;
    if (x > this.maxX) this.maxX = x;
    if (y < this.minY) this.minY = y;
    if (y > this.maxY) this.maxY = y;
    if (z < this.minZ) this.minZ = z;
    if (z > this.maxZ) this.maxZ = z;
    const i = this.n++;
    if (this.keep || this.unique) {
      if (i * 3 + 3 > this.data.length) this.grow();
      const d = this.data;
      d[i * 3] = x;
      d[i * 3 + 1] = y;
      d[i * 3 + 2] = z;
      if (this.unique) this.insert(i);
    }
    return i;
  }

  /** Label of point `index` (text column of a CSV); unlabelled points keep label 0 = none. */
  setLabel(index: number, label: string): void {
    if (!this.keep) {
      this.nameOf(label);
      return;
    }
    if (!this.labelOf) this.labelOf = new Uint16Array(Math.max(16, this.data.length / 3));
    if (index >= this.labelOf.length) {
      const next = new Uint16Array(Math.max(this.data.length / 3, index + 1));
      next.set(this.labelOf);
      this.labelOf = next;
    }
    this.labelOf[index] = this.nameOf(label);
  }

  private nameOf(label: string): number {
    let id = this.labelIds.get(label);
    if (id === undefined) {
      if (this.labelNames.length >= MAX_LABELS) {
        throw new MeasureFileError('measure.columns', `The label column holds more than ${MAX_LABELS} different labels${this.where()}; labels name features (H1, H2, BORE), not single points.`);
      }
      this.labelNames.push(label);
      id = this.labelNames.length;
      this.labelIds.set(label, id);
    }
    return id;
  }

  private grow(): void {
    const cap = Math.min(Math.max(this.data.length * 2, 48), (this.maxPoints + 1) * 3);
    const next = new Float64Array(cap);
    next.set(this.data.subarray(0, this.n * 3));
    this.data = next;
  }

  private hash(x: number, y: number, z: number): number {
    scratch[0] = x + 0; // -0 and 0 are the same point
    scratch[1] = y + 0;
    scratch[2] = z + 0;
    let h = 0x811c9dc5;
    for (let k = 0; k < 6; k++) {
      h ^= scratchBits[k]!;
      h = Math.imul(h, 0x01000193);
    }
    h ^= h >>> 15;
    return h >>> 0;
  }

  private find(x: number, y: number, z: number): number {
    const t = this.table;
    const mask = t.length - 1;
    const d = this.data;
    for (let slot = this.hash(x, y, z) & mask; ; slot = (slot + 1) & mask) {
      const e = t[slot]!;
      if (e === 0) return -1;
      const j = (e - 1) * 3;
      if (d[j] === x && d[j + 1] === y && d[j + 2] === z) return e - 1;
    }
  }

  private insert(i: number): void {
    if ((this.n) * 2 > this.table.length) this.rehash();
    const t = this.table;
    const mask = t.length - 1;
    const d = this.data;
    let slot = this.hash(d[i * 3]!, d[i * 3 + 1]!, d[i * 3 + 2]!) & mask;
    while (t[slot] !== 0) slot = (slot + 1) & mask;
    t[slot] = i + 1;
  }

  private rehash(): void {
    const t = new Int32Array(this.table.length * 2);
    const mask = t.length - 1;
    const d = this.data;
    for (let i = 0; i < this.n - 1; i++) {
      let slot = this.hash(d[i * 3]!, d[i * 3 + 1]!, d[i * 3 + 2]!) & mask;
      while (t[slot] !== 0) slot = (slot + 1) & mask;
      t[slot] = i + 1;
    }
    this.table = t;
  }

  bbox(): BoundingBox | null {
    if (this.n === 0) return null;
    return {
      min: { x: this.minX, y: this.minY, z: this.minZ },
      max: { x: this.maxX, y: this.maxY, z: this.maxZ },
    };
  }

  /** The points, trimmed to their count (a view when it fits exactly, else one copy). */
  points(): Float64Array | null {
    if (!this.keep) return null;
    this.table = new Int32Array(0);
    const used = this.n * 3;
    return used === this.data.length ? this.data : this.data.slice(0, used);
  }

  labels(): { names: string[]; index: Uint16Array | null } {
    if (this.labelNames.length === 0 || !this.keep) return { names: [...this.labelNames], index: null };
    const full = new Uint16Array(this.n);
    if (this.labelOf) full.set(this.labelOf.subarray(0, Math.min(this.n, this.labelOf.length)));
    return { names: [...this.labelNames], index: full };
  }

}

function nextPow2(v: number): number {
  let p = 16;
  while (p < v) p *= 2;
  return p;
}
