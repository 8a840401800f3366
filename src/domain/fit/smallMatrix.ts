/**
 * Small dense linear algebra for the fits: symmetric eigen-decomposition (cyclic Jacobi),
 * one-sided Jacobi SVD, and a streaming Givens QR that reduces n rows to a k×k triangle
 * without keeping the rows. Matrices are row-major Float64Arrays. Internal to the fits.
 */

/**
 * Eigen-decomposition of a symmetric k×k matrix (row-major, not modified).
 * Returns eigenvalues ascending and the matching unit eigenvectors as columns of `vectors`.
 */
export function symmetricEigen(matrix: Float64Array, k: number): { values: Float64Array; vectors: Float64Array } {
  const a = Float64Array.from(matrix);
  const v = new Float64Array(k * k);
  for (let i = 0; i < k; i++) v[i * k + i] = 1;

  for (let sweep = 0; sweep < 100; sweep++) {
    let off = 0;
    let diag = 0;
    for (let p = 0; p < k; p++) {
      diag += a[p * k + p]! * a[p * k + p]!;
      for (let q = p + 1; q < k; q++) off += a[p * k + q]! * a[p * k + q]!;
    }
    if (off <= 1e-30 * diag || off === 0) break;
    for (let p = 0; p < k; p++) {
      for (let q = p + 1; q < k; q++) {
        const apq = a[p * k + q]!;
        if (apq === 0) continue;
        const app = a[p * k + p]!;
        const aqq = a[q * k + q]!;
        const theta = (aqq - app) / (2 * apq);
        const t = (theta >= 0 ? 1 : -1) / (Math.abs(theta) + Math.sqrt(theta * theta + 1));
        const c = 1 / Math.sqrt(t * t + 1);
        const s = t * c;
        for (let r = 0; r < k; r++) {
          const arp = a[r * k + p]!;
          const arq = a[r * k + q]!;
          a[r * k + p] = c * arp - s * arq;
          a[r * k + q] = s * arp + c * arq;
        }
        for (let r = 0; r < k; r++) {
          const apr = a[p * k + r]!;
          const aqr = a[q * k + r]!;
          a[p * k + r] = c * apr - s * aqr;
          a[q * k + r] = s * apr + c * aqr;
        }
        for (let r = 0; r < k; r++) {
          const vrp = v[r * k + p]!;
          const vrq = v[r * k + q]!;
          v[r * k + p] = c * vrp - s * vrq;
          v[r * k + q] = s * vrp + c * vrq;
        }
      }
    }
  }

  const order = Array.from({ length: k }, (_, i) => i).sort((i, j) => a[i * k + i]! - a[j * k + j]!);
  const values = new Float64Array(k);
  const vectors = new Float64Array(k * k);
  order.forEach((src, dst) => {
    values[dst] = a[src * k + src]!;
    for (let r = 0; r < k; r++) vectors[r * k + dst] = v[r * k + src]!;
  });
  return { values, vectors };
}

/**
 * One-sided Jacobi SVD of a k×k matrix (row-major, not modified): singular values ascending and
 * the right singular vectors as columns. Accurate for small singular values (no AᵀA formed).
 */
export function rightSingular(matrix: Float64Array, k: number): { values: Float64Array; vectors: Float64Array } {
  const a = Float64Array.from(matrix);
  const v = new Float64Array(k * k);
  for (let i = 0; i < k; i++) v[i * k + i] = 1;
  for (let sweep = 0; sweep < 100; sweep++) {
    let rotated = false;
    for (let p = 0; p < k; p++) {
      for (let q = p + 1; q < k; q++) {
        let alpha = 0;
        let beta = 0;
        let gamma = 0;
        for (let r = 0; r < k; r++) {
          const x = a[r * k + p]!;
          const y = a[r * k + q]!;
          alpha += x * x;
          beta += y * y;
          gamma += x * y;
        }
        if (gamma === 0 || Math.abs(gamma) <= 1e-15 * Math.sqrt(alpha * beta)) continue;
        rotated = true;
        const zeta = (beta - alpha) / (2 * gamma);
        const t = (zeta >= 0 ? 1 : -1) / (Math.abs(zeta) + Math.sqrt(1 + zeta * zeta));
        const c = 1 / Math.sqrt(1 + t * t);
        const s = c * t;
        for (let r = 0; r < k; r++) {
          const x = a[r * k + p]!;
          const y = a[r * k + q]!;
          a[r * k + p] = c * x - s * y;
          a[r * k + q] = s * x + c * y;
          const vx = v[r * k + p]!;
          const vy = v[r * k + q]!;
          v[r * k + p] = c * vx - s * vy;
          v[r * k + q] = s * vx + c * vy;
        }
      }
    }
    if (!rotated) break;
  }
  const norms = new Float64Array(k);
  for (let p = 0; p < k; p++) {
    let sum = 0;
    for (let r = 0; r < k; r++) sum += a[r * k + p]! * a[r * k + p]!;
    norms[p] = Math.sqrt(sum);
  }
  const order = Array.from({ length: k }, (_, i) => i).sort((i, j) => norms[i]! - norms[j]!);
  const values = new Float64Array(k);
  const vectors = new Float64Array(k * k);
  order.forEach((src, dst) => {
    values[dst] = norms[src]!;
    for (let r = 0; r < k; r++) vectors[r * k + dst] = v[r * k + src]!;
  });
  return { values, vectors };
}

/**
 * Streaming QR by Givens rotations: feed rows one at a time, keep only the k×k upper triangle R
 * with RᵀR = BᵀB. `row` is used as scratch and is overwritten.
 */
export class GivensTriangle {
  readonly k: number;
  readonly r: Float64Array;

  constructor(k: number) {
    this.k = k;
    this.r = new Float64Array(k * k);
  }

  add(row: Float64Array): void {
    const k = this.k;
    const r = this.r;
    for (let j = 0; j < k; j++) {
      const b = row[j]!;
      if (b === 0) continue;
      const a = r[j * k + j]!;
      const h = Math.sqrt(a * a + b * b);
      const c = a / h;
      const s = b / h;
      r[j * k + j] = h;
      row[j] = 0;
      for (let m = j + 1; m < k; m++) {
        const t = r[j * k + m]!;
        const w = row[m]!;
        r[j * k + m] = c * t + s * w;
        row[m] = c * w - s * t;
      }
    }
  }
}

/** Solves a k×k system by Gaussian elimination with partial pivoting; null when singular. */
export function solveSmall(matrix: Float64Array, rhs: Float64Array, k: number): Float64Array | null {
  const a = Float64Array.from(matrix);
  const b = Float64Array.from(rhs);
  let scale = 0;
  for (let i = 0; i < k * k; i++) scale = Math.max(scale, Math.abs(a[i]!));
  if (scale === 0) return null;
  for (let col = 0; col < k; col++) {
    let piv = col;
    for (let r = col + 1; r < k; r++) if (Math.abs(a[r * k + col]!) > Math.abs(a[piv * k + col]!)) piv = r;
    if (Math.abs(a[piv * k + col]!) <= 1e-14 * scale) return null;
    if (piv !== col) {
      for (let c = 0; c < k; c++) {
        const t = a[col * k + c]!;
        a[col * k + c] = a[piv * k + c]!;
        a[piv * k + c] = t;
      }
      const t = b[col]!;
      b[col] = b[piv]!;
      b[piv] = t;
    }
    for (let r = col + 1; r < k; r++) {
      const f = a[r * k + col]! / a[col * k + col]!;
      if (f === 0) continue;
      for (let c = col; c < k; c++) a[r * k + c] = a[r * k + c]! - f * a[col * k + c]!;
      b[r] = b[r]! - f * b[col]!;
    }
  }
  const x = new Float64Array(k);
  for (let r = k - 1; r >= 0; r--) {
    let sum = b[r]!;
    for (let c = r + 1; c < k; c++) sum -= a[r * k + c]! * x[c]!;
    x[r] = sum / a[r * k + r]!;
  }
  return x;
}
