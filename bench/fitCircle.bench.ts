/**
 * Circle and plane fits on scan-sized inputs. Run:
 *   npx vitest bench --config vitest.config.ts --run bench/fitCircle.bench.ts
 */
import { bench, describe } from 'vitest';
import { fitCircle } from '../src/domain/fit/circle';
import { fitPlane } from '../src/domain/fit/plane';

function noisyCircle(n: number): Float64Array {
  const flat = new Float64Array(2 * n);
  let seed = 12345;
  const rand = (): number => {
    seed = (seed * 1103515245 + 12345) & 0x7fffffff;
    return seed / 0x7fffffff - 0.5;
  };
  for (let i = 0; i < n; i++) {
    const t = (2 * Math.PI * i) / n;
    const r = 150 + 0.02 * rand();
    flat[2 * i] = 1000 + r * Math.cos(t);
    flat[2 * i + 1] = -2000 + r * Math.sin(t);
  }
  return flat;
}

function noisyPlane(n: number): Float64Array {
  const flat = new Float64Array(3 * n);
  const side = Math.ceil(Math.sqrt(n));
  for (let i = 0; i < n; i++) {
    const x = (i % side) * 0.5;
    const y = Math.floor(i / side) * 0.5;
    flat[3 * i] = x;
    flat[3 * i + 1] = y;
    flat[3 * i + 2] = 0.001 * x - 0.002 * y + 0.01 * Math.sin(i);
  }
  return flat;
}

const circle2M = noisyCircle(2_000_000);
const circle10k = noisyCircle(10_000);
const plane2M = noisyPlane(2_000_000);

describe('circle fit', () => {
  bench('geometric, 10 000 points', () => {
    fitCircle(circle10k);
  });
  bench('geometric, 2 000 000 points', () => {
    fitCircle(circle2M);
  }, { iterations: 5 });
  bench('kasa, 2 000 000 points', () => {
    fitCircle(circle2M, { method: 'kasa' });
  }, { iterations: 5 });
});

describe('plane fit', () => {
  bench('2 000 000 points', () => {
    fitPlane(plane2M);
  }, { iterations: 5 });
});
