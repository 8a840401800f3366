import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { eq, sql } from 'drizzle-orm';
import { closeDb, getDb } from '../../src/server/db/client';
import { uploads, users } from '../../src/server/db/schema';
import { createProject } from '../../src/server/repos/projects';
import { localFolderStore, pendingFiles } from '../../src/server/storage';
import { startServer, testAppPort, type RunningServer } from '../support/server';
import { ApiClient, makeUser, tag } from '../support/auth';
import { postUpload } from '../support/measureUploads';
import { SMALL_FACE, makeFace, writePlyAscii, writePlyBinary, writeStlAscii, writeStlBinary, writeXyz } from '../fixtures/measure/syntheticFace';

// Measurement uploads against the built server and the real test MariaDB: every format in, every
// malformed case refused with its line or byte — and no row, no stored file, no leftover part.

const PASSWORD = `Probe-Arm-${tag()}-Flange`;
const MAX_BYTES = 3_000_000;
const MAX_POINTS = 60_000;
const uploadDir = mkdtempSync(join(tmpdir(), 'platewright-uploads-'));
const store = localFolderStore(uploadDir);
let server: RunningServer;
let owner: ApiClient;
let outsider: ApiClient;
let machinist: ApiClient;
let projectId: number;
const db = () => getDb();
const face = makeFace(SMALL_FACE);
const enc = (s: string) => new TextEncoder().encode(s);
const sha = (b: Uint8Array) => createHash('sha256').update(b).digest('hex');

async function signedIn(role: 'designer' | 'machinist') {
  const u = await makeUser(db(), { role, password: PASSWORD });
  const c = new ApiClient(server.baseUrl);
  const r = await c.signIn(u.email, PASSWORD);
  expect(r.status, JSON.stringify(r.body) + server.output()).toBe(200);
  return { c, u };
}

async function uploadRows(): Promise<number> {
  const [{ n }] = await db().select({ n: sql<number>`count(*)` }).from(uploads).where(eq(uploads.projectId, projectId));
  return Number(n);
}

beforeAll(async () => {
  server = await startServer(testAppPort(10), { UPLOAD_DIR: uploadDir, UPLOAD_MAX_BYTES: String(MAX_BYTES), UPLOAD_MAX_POINTS: String(MAX_POINTS) });
  const o = await signedIn('designer');
  owner = o.c;
  outsider = (await signedIn('designer')).c;
  machinist = (await signedIn('machinist')).c;
  const [me] = await db().select().from(users).where(eq(users.id, o.u.id));
  ({ id: projectId } = await createProject(db(), { id: o.u.id, email: o.u.email, name: me!.name, role: 'designer' }, { name: `Uploads ${tag()}`, swapDescription: 'invented test swap for measurements' }));
});
afterAll(async () => {
  await server?.stop();
  await closeDb();
  rmSync(uploadDir, { recursive: true, force: true });
});

const stlVertexCount = new Set(Array.from(face.triangles)).size;

const goodFiles: { name: string; bytes: Uint8Array; points: number; format: string; encoding: string }[] = [
  { name: 'face.xyz', bytes: enc(writeXyz(face.points, { header: true })), points: face.points.length / 3, format: 'xyz', encoding: 'ascii' },
  { name: 'face.csv', bytes: enc(writeXyz(face.points, { csv: true, header: true })), points: face.points.length / 3, format: 'csv', encoding: 'ascii' },
  { name: 'face-ascii.ply', bytes: enc(writePlyAscii(face.points)), points: face.points.length / 3, format: 'ply', encoding: 'ascii' },
  { name: 'face.ply', bytes: writePlyBinary(face.points, { triangles: face.triangles }), points: face.points.length / 3, format: 'ply', encoding: 'binary' },
  { name: 'face-ascii.stl', bytes: enc(writeStlAscii(face.points, face.triangles.subarray(0, 3 * 3000))), points: new Set(Array.from(face.triangles.subarray(0, 9000))).size, format: 'stl', encoding: 'ascii' },
  { name: 'face.stl', bytes: writeStlBinary(face.points, face.triangles), points: stlVertexCount, format: 'stl', encoding: 'binary' },
];

describe('POST /api/projects/:id/uploads', () => {
  it.each(goodFiles)('stores $name with its summary: $format $encoding, every point counted', async (f) => {
    expect(f.bytes.length).toBeLessThan(MAX_BYTES);
    const before = await uploadRows();
    const r = await postUpload(owner, projectId, { name: f.name, bytes: f.bytes }, { units: 'mm' });
    expect(r.status, JSON.stringify(r.body)).toBe(201);
    const u = r.body.upload;
    expect(u.fileName).toBe(f.name);
    expect(u.format).toBe(f.format);
    expect(u.sizeBytes).toBe(f.bytes.length);
    expect(u.sha256).toBe(sha(f.bytes));
    expect(u.summary.encoding).toBe(f.encoding);
    expect(u.summary.pointCount).toBe(f.points);
    expect(u.summary.units).toBe('mm');
    expect(u.summary.unitsCheck.plausible).toBe(true);
    // the face is ~124 mm across, tilted a little
    expect(u.summary.unitsCheck.extentMm).toBeGreaterThan(100);
    expect(u.summary.unitsCheck.extentMm).toBeLessThan(140);
    expect(await uploadRows()).toBe(before + 1);
    const [row] = await db().select().from(uploads).where(eq(uploads.id, u.id));
    const stored: Uint8Array[] = [];
    for await (const chunk of store.read(row!.storageKey)) stored.push(chunk);
    expect(sha(Buffer.concat(stored))).toBe(sha(f.bytes));
    const file = await owner.get(`/api/uploads/${u.id}/file`);
    expect(file.status).toBe(200);
  });

  it('says when the chosen unit is implausible for the size of the cloud', async () => {
    const r = await postUpload(owner, projectId, { name: 'face-in.ply', bytes: goodFiles[3]!.bytes }, { units: 'in' });
    expect(r.status).toBe(201);
    expect(r.body.upload.summary.unitsCheck.plausible).toBe(false);
    expect(r.body.upload.summary.unitsCheck.message).toMatch(/larger than any flange.*millimetres/);
  });

  const xyz = (lines: string[]) => enc(lines.join('\n') + '\n');
  const plyBin = writePlyBinary(face.points.subarray(0, 300));
  const plyNaN = (() => {
    const b = writePlyBinary(face.points.subarray(0, 300));
    const head = new TextDecoder().decode(b.subarray(0, 400)).indexOf('end_header\n') + 'end_header\n'.length;
    new DataView(b.buffer).setFloat32(head + 13 * 7 + 4, NaN, true); // vertex 7, y
    return { bytes: b, offset: head + 13 * 7 + 4 };
  })();
  const stlBin = writeStlBinary(face.points, face.triangles.subarray(0, 300));
  // long lines: over the byte limit with fewer points than the point limit
  const bigLine = '1.000000000000001 2.000000000000001 3.000000000000001\n';
  const bigText = enc(bigLine.repeat(Math.ceil(MAX_BYTES / bigLine.length) + 100));
  const manyPoints = writePlyBinary(new Float64Array(3 * (MAX_POINTS + 10)).map((_, i) => i % 997));

  const badFiles: { what: string; name: string; bytes: Uint8Array; status: number; code: string; message: RegExp; line?: number; byteOffset?: number; fields?: Record<string, string> }[] = [
    { what: 'a NaN in an XYZ row', name: 'nan.xyz', bytes: xyz(['1 2 3', '4 5 6', '7 8 9', '1 2 3', '4 NaN 6']), status: 400, code: 'measure.nonFinite', message: /Line 5, column 2: "NaN" is not a finite number/, line: 5 },
    { what: 'a non-numeric row', name: 'text.xyz', bytes: xyz(['1 2 3', '4 5 6', 'four five six']), status: 400, code: 'measure.badNumber', message: /Line 3, column 1: "four" is not a number/, line: 3 },
    { what: 'a decimal comma', name: 'comma.csv', bytes: xyz(['x;y;z', '1;2;3', '1,5;2;3']), status: 400, code: 'measure.badNumber', message: /Line 3.*decimal comma/, line: 3 },
    { what: 'a row with two values', name: 'short.csv', bytes: xyz(['x,y,z', '1,2,3', '1,2']), status: 400, code: 'measure.columns', message: /Line 3 has 2 values/, line: 3 },
    { what: 'a header without z', name: 'header.csv', bytes: xyz(['x,y,height', '1,2,3']), status: 400, code: 'measure.header', message: /names no z column/, line: 1 },
    { what: 'a truncated binary PLY', name: 'cut.ply', bytes: plyBin.subarray(0, plyBin.length - 20), status: 400, code: 'measure.truncated', message: /ends at byte \d+ inside vertex 98: its header announces 100 vertices of 13 bytes.*only 98 are complete — it was cut short/, byteOffset: plyBin.length - 20 },
    { what: 'a NaN vertex in a binary PLY', name: 'nan.ply', bytes: plyNaN.bytes, status: 400, code: 'measure.nonFinite', message: /Vertex 7 \(byte \d+\) has y = NaN/, byteOffset: plyNaN.offset },
    { what: 'a big-endian PLY', name: 'big.ply', bytes: enc('ply\nformat binary_big_endian 1.0\nelement vertex 1\nproperty float x\nproperty float y\nproperty float z\nend_header\n\0\0\0\0\0\0\0\0\0\0\0\0'), status: 400, code: 'measure.unsupported', message: /big-endian/, line: 2 },
    { what: 'a truncated binary STL', name: 'cut.stl', bytes: stlBin.subarray(0, 84 + 50 * 40 + 17), status: 400, code: 'measure.truncated', message: /ends at byte 2101, inside triangle 40 of 100/, byteOffset: 2101 },
    { what: 'a truncated ASCII STL', name: 'cut-ascii.stl', bytes: enc(writeStlAscii(face.points, face.triangles.subarray(0, 30)).split('\n').slice(0, 20).join('\n')), status: 400, code: 'measure.truncated', message: /ends at line 20 inside the facet/, line: 20 },
    { what: 'a PLY named .xyz', name: 'scan.xyz', bytes: plyBin, status: 400, code: 'measure.formatMismatch', message: /named \.xyz but its content is a PLY file.*Rename it to \.ply/, byteOffset: 0 },
    { what: 'a binary STL named .ply', name: 'mesh.ply', bytes: stlBin, status: 400, code: 'measure.formatMismatch', message: /named \.ply but its content is binary data \(byte 28 is 0x00\)/, byteOffset: 28 },
    { what: 'a text list named .stl', name: 'points.stl', bytes: xyz(['1 2 3', '4 5 6']), status: 400, code: 'measure.formatMismatch', message: /named \.stl but its content is a text point list/, byteOffset: 0 },
    { what: 'an infinite value', name: 'inf.xyz', bytes: xyz(['1 2 3', '1 Infinity 3']), status: 400, code: 'measure.nonFinite', message: /Line 2, column 2: "Infinity" is not a finite number/, line: 2 },
    { what: 'bytes after a binary STL\'s triangles', name: 'long.stl', bytes: new Uint8Array([...stlBin, 1, 2, 3, 4, 5, 6, 7]), status: 400, code: 'measure.syntax', message: /7 bytes after the 100 triangles its header announces/, byteOffset: stlBin.length },
    { what: 'an unknown extension', name: 'scan.obj', bytes: xyz(['v 1 2 3']), status: 400, code: 'measure.unsupported', message: /no known extension/ },
    { what: 'an empty file', name: 'empty.xyz', bytes: new Uint8Array(0), status: 400, code: 'measure.empty', message: /is empty/ },
    { what: 'a file over the size limit', name: 'big.xyz', bytes: bigText, status: 413, code: 'too_large', message: /larger than 3 MB/ },
    { what: 'more points than allowed', name: 'many.ply', bytes: manyPoints, status: 413, code: 'measure.tooManyPoints', message: /announces 60,010 vertices, more than the 60,000/ },
    { what: 'no units', name: 'ok.xyz', bytes: xyz(['1 2 3', '4 5 6', '7 8 10']), status: 400, code: 'units_required', message: /Choose the units of ok\.xyz/, fields: {} },
    { what: 'units that are not mm or in', name: 'ok.xyz', bytes: xyz(['1 2 3', '4 5 6', '7 8 10']), status: 400, code: 'units_required', message: /"mm" or "in"/, fields: { units: 'cm' } },
  ];

  it.each(badFiles)('refuses $what with a clear message and keeps nothing', async (f) => {
    const rowsBefore = await uploadRows();
    const storedBefore = await store.list();
    const r = await postUpload(owner, projectId, { name: f.name, bytes: f.bytes }, f.fields ?? { units: 'mm' });
    expect(r.status, JSON.stringify(r.body)).toBe(f.status);
    expect(r.body.error.code).toBe(f.code);
    expect(r.body.error.message, r.body.error.message).toMatch(f.message);
    if (f.line !== undefined) expect(r.body.error.line).toBe(f.line);
    if (f.byteOffset !== undefined) expect(r.body.error.byteOffset).toBe(f.byteOffset);
    expect(await uploadRows()).toBe(rowsBefore);
    expect(await store.list()).toEqual(storedBefore);
    expect(await pendingFiles(uploadDir)).toEqual([]);
  });

  it('refuses a request that is not multipart, and one without a file', async () => {
    const notMultipart = await owner.post(`/api/projects/${projectId}/uploads`, { units: 'mm' });
    expect(notMultipart.status).toBe(400);
    expect(notMultipart.body.error.code).toBe('not_multipart');
    const noFile = await postUpload(owner, projectId, null, { units: 'mm' });
    expect(noFile.status).toBe(400);
    expect(noFile.body.error.code).toBe('no_file');
  });

  it('lets only people who may change the project upload; others see 401/403/404 and nothing is stored', async () => {
    const storedBefore = await store.list();
    const file = { name: 'face.xyz', bytes: goodFiles[0]!.bytes };
    const anonymous = await postUpload(new ApiClient(server.baseUrl), projectId, file);
    expect(anonymous.status).toBe(401);
    const other = await postUpload(outsider, projectId, file);
    expect(other.status).toBe(404);
    const shop = await postUpload(machinist, projectId, file);
    expect(shop.status).toBe(403);
    expect(await store.list()).toEqual(storedBefore);
    expect(await pendingFiles(uploadDir)).toEqual([]);
  });
});

describe('GET uploads and POST /api/uploads/:id/fit', () => {
  let uploadId: number;
  beforeAll(async () => {
    const r = await postUpload(owner, projectId, { name: 'fit-face.ply', bytes: goodFiles[3]!.bytes }, { units: 'mm' });
    expect(r.status).toBe(201);
    uploadId = r.body.upload.id;
  });

  it('lists the project uploads with who uploaded them, and shows one', async () => {
    const list = await owner.get(`/api/projects/${projectId}/uploads`);
    expect(list.status).toBe(200);
    expect(list.body.uploads[0].id).toBe(uploadId);
    expect(list.body.uploads[0].uploadedBy.name).toMatch(/Test designer/);
    const one = await owner.get(`/api/uploads/${uploadId}`);
    expect(one.status).toBe(200);
    expect(one.body.upload.summary.pointCount).toBe(face.points.length / 3);
    expect(one.body.upload).not.toHaveProperty('storageKey');
    expect((await outsider.get(`/api/uploads/${uploadId}`)).status).toBe(404);
  });

  it('fits the face plane: normal of the synthetic face, flatness from its noise', async () => {
    const r = await owner.post(`/api/uploads/${uploadId}/fit`, { kind: 'plane' });
    expect(r.status, JSON.stringify(r.body)).toBe(200);
    const n = r.body.result.plane.normal;
    const [a, b, c] = SMALL_FACE.normal;
    const l = Math.hypot(a, b, c);
    // float32 storage of the PLY and 0.02 mm noise: the normal agrees to well under 1e-4
    expect(Math.abs(n.x - a / l)).toBeLessThan(1e-4);
    expect(Math.abs(n.y - b / l)).toBeLessThan(1e-4);
    expect(Math.abs(n.z - c / l)).toBeLessThan(1e-4);
    expect(r.body.result.plane.sigmaMm).toBeGreaterThan(0.015);
    expect(r.body.result.plane.sigmaMm).toBeLessThan(0.025);
    expect(r.body.result.face.w).toEqual(n);
  });

  it('finds the holes: the bore and six bolt holes, the oval one flagged', async () => {
    const r = await owner.post(`/api/uploads/${uploadId}/fit`, { kind: 'holes' });
    expect(r.status).toBe(200);
    const holes = r.body.result.holes as { diameterMm: number; flags: string[]; id: string }[];
    expect(holes).toHaveLength(7);
    expect(holes.filter((h) => Math.abs(h.diameterMm - 8.5) < 0.1 && h.flags.length === 0)).toHaveLength(5);
    expect(holes.filter((h) => h.flags.includes('oval'))).toHaveLength(1);
    expect(holes.filter((h) => Math.abs(h.diameterMm - 40) < 0.1)).toHaveLength(1);
    expect(r.body.result.suggestedPattern).toHaveLength(6);
  });

  it('fits a circle in a box and a bore cylinder; refuses empty and malformed requests', async () => {
    const holes = (await owner.post(`/api/uploads/${uploadId}/fit`, { kind: 'holes' })).body.result.holes;
    const bore = holes.find((h: { diameterMm: number }) => h.diameterMm > 30);
    const box = (h: { centerU: number; centerV: number }, half: number) => ({ kind: 'box', uMin: h.centerU - half, uMax: h.centerU + half, vMin: h.centerV - half, vMax: h.centerV + half });
    const circle = await owner.post(`/api/uploads/${uploadId}/fit`, { kind: 'circle', region: box(bore, 25) });
    expect(circle.status).toBe(200);
    expect(Math.abs(circle.body.result.hole.centerU - bore.centerU)).toBeLessThan(0.01);
    expect(Math.abs(circle.body.result.hole.diameterMm - 40)).toBeLessThan(0.05);
    const cyl = await owner.post(`/api/uploads/${uploadId}/fit`, { kind: 'cylinder', region: box(bore, 23) });
    expect(cyl.status, JSON.stringify(cyl.body)).toBe(200);
    expect(Math.abs(cyl.body.result.cylinder.diameterMm - 40)).toBeLessThan(0.05);
    expect(cyl.body.result.axisOnFace.tiltDeg).toBeLessThan(0.2);
    expect(Math.hypot(cyl.body.result.axisOnFace.u - bore.centerU, cyl.body.result.axisOnFace.v - bore.centerV)).toBeLessThan(0.05);

    const nothing = await owner.post(`/api/uploads/${uploadId}/fit`, { kind: 'circle', region: { kind: 'box', uMin: 500, uMax: 501, vMin: 500, vMax: 501 } });
    expect(nothing.status).toBe(422);
    expect(nothing.body.error.message).toMatch(/selection holds 0 points/);
    const bad = await owner.post(`/api/uploads/${uploadId}/fit`, { kind: 'circle' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toMatch(/region/);
    const unknown = await owner.post(`/api/uploads/${uploadId}/fit`, { kind: 'sphere' });
    expect(unknown.status).toBe(400);
  });
});
