import { describe, expect, it } from 'vitest';
import { statSync } from 'node:fs';
import { APPROX_WASM_BYTES, progressFraction } from '../../../src/cad/kernelClient';

describe('kernel progress for the bar', () => {
  it('maps download bytes to 0–90 %, start-up to 95 %, ready to 100 % (hand values)', () => {
    expect(progressFraction(null)).toBe(0);
    expect(progressFraction({ phase: 'download', loadedBytes: 5, totalBytes: 10 })).toBeCloseTo(0.45, 12);
    expect(progressFraction({ phase: 'download', loadedBytes: 20, totalBytes: 10 })).toBe(0.9); // never past 90 % while downloading
    // compressed response: total unknown, the wasm's size stands in
    expect(progressFraction({ phase: 'download', loadedBytes: APPROX_WASM_BYTES / 2, totalBytes: null })).toBeCloseTo(0.45, 12);
    expect(progressFraction({ phase: 'starting' })).toBe(0.95);
    expect(progressFraction({ phase: 'ready', ms: 800 })).toBe(1);
  });

  it('the stand-in size is the shipped wasm file size', () => {
    expect(APPROX_WASM_BYTES).toBe(statSync('node_modules/replicad-opencascadejs/dist/replicad_single.wasm').size);
  });
});
