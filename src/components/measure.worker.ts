/**
 * The measurement worker: parses a file and runs the fits off the main thread, with the same
 * domain code the server's fit API runs. Reached through comlink.
 */
import * as Comlink from 'comlink';
import { MeasureFileParser } from '../domain/measure/formats';
import type { FitRequest } from '../domain/measure/fitRequest';
import { MeasureSession, scaleToMm, type FitResponse } from '../domain/measure/session';
import { MM_SCALE } from '../domain/measure/unitsHint';
import type { LengthUnit } from '../domain/units';

export type Progress = (stage: 'reading' | 'fitting', done: number, total: number) => void;

let session: MeasureSession | null = null;

async function parseStream(stream: ReadableStream<Uint8Array>, fileName: string, size: number, units: LengthUnit, onProgress: Progress) {
  const parser = new MeasureFileParser({ fileName, keep: true, maxPoints: 20_000_000 });
  const reader = stream.getReader();
  let done = 0;
  let last = 0;
  for (;;) {
    const r = await reader.read();
    if (r.done) break;
    parser.push(r.value);
    done += r.value.length;
    if (done - last > 1 << 20) {
      last = done;
      onProgress('reading', done, size);
    }
  }
  onProgress('reading', size, size);
  const parsed = parser.end();
  const points = scaleToMm(parsed.points!, MM_SCALE[units]);
  session = new MeasureSession(points, { names: parsed.labels, index: parsed.labelIndex });
  return { count: parsed.count, labels: [...parsed.labels] };
}

const api = {
  async loadFile(file: File, units: LengthUnit, onProgress: Progress) {
    return parseStream(file.stream(), file.name, file.size, units, onProgress);
  },
  async loadUrl(url: string, fileName: string, size: number, units: LengthUnit, onProgress: Progress) {
    const r = await fetch(url, { credentials: 'same-origin' });
    if (!r.ok || !r.body) throw new Error(`The stored file could not be read (${r.status}).`);
    return parseStream(r.body, fileName, size, units, onProgress);
  },
  run(request: FitRequest): FitResponse {
    if (!session) throw new Error('No measurement loaded.');
    return session.run(request);
  },
  /** Face points (u, v), thinned to at most `max` for drawing; fits use every point. */
  facePoints(max: number): Float32Array {
    if (!session) throw new Error('No measurement loaded.');
    const { uv } = session.faceFit();
    const n = uv.length / 2;
    const step = Math.max(1, Math.ceil(n / max));
    const out = new Float32Array(2 * Math.ceil(n / step));
    for (let i = 0, k = 0; i < n; i += step, k++) {
      out[2 * k] = uv[2 * i]!;
      out[2 * k + 1] = uv[2 * i + 1]!;
    }
    return Comlink.transfer(out, [out.buffer]);
  },
  /** All points in face coordinates (u, v, w), thinned, for the 3D view; inlier flag per point. */
  cloudPoints(max: number): { xyz: Float32Array; onFace: Uint8Array } {
    if (!session) throw new Error('No measurement loaded.');
    const f = session.faceFit();
    const p = session.points;
    const n = p.length / 3;
    const step = Math.max(1, Math.ceil(n / max));
    const m = Math.ceil(n / step);
    const xyz = new Float32Array(3 * m);
    const onFace = new Uint8Array(m);
    const { origin: o, u, v, w } = f.axes;
    for (let i = 0, k = 0; i < n; i += step, k++) {
      const dx = p[3 * i]! - o.x;
      const dy = p[3 * i + 1]! - o.y;
      const dz = p[3 * i + 2]! - o.z;
      xyz[3 * k] = dx * u.x + dy * u.y + dz * u.z;
      xyz[3 * k + 1] = dx * v.x + dy * v.y + dz * v.z;
      xyz[3 * k + 2] = dx * w.x + dy * w.y + dz * w.z;
      onFace[k] = f.fit.inliers[i]!;
    }
    return Comlink.transfer({ xyz, onFace }, [xyz.buffer, onFace.buffer]);
  },
};

export type MeasureWorkerApi = typeof api;
Comlink.expose(api);
