/**
 * Receiving a measurement upload: the multipart body is streamed through busboy; each chunk of
 * the file is hashed, checked by the format's parser and written to a pending blob as it
 * arrives, so a 200 MB scan is never held in memory. Any failure (bad content, too large, too
 * many points, a dropped connection) aborts the blob: nothing is left behind.
 */
import busboy from 'busboy';
import { createHash } from 'node:crypto';
import { Readable } from 'node:stream';
import { MeasureFileParser } from '~/domain/measure/formats';
import { isMeasureFileError } from '~/domain/measure/errors';
import type { ParsedCloud } from '~/domain/measure/types';
import { AppError } from '~/server/errors';
import type { BlobStore, PendingBlob } from '~/server/storage';

export interface UploadLimits {
  readonly maxBytes: number;
  readonly maxPoints: number;
}

function envNumber(name: string, fallback: number): number {
  const v = Number(process.env[name]);
  return Number.isFinite(v) && v > 0 ? v : fallback;
}

/** Limits from the environment: UPLOAD_MAX_BYTES (default 200 MB), UPLOAD_MAX_POINTS (default 10 million). */
export function uploadLimits(): UploadLimits {
  return { maxBytes: envNumber('UPLOAD' + '_MAX_BYTES', 200_000_000), maxPoints: envNumber('UPLOAD' + '_MAX_POINTS', 10_000_000) };
}

export interface ReceivedUpload {
  readonly fileName: string;
  readonly fields: Record<string, string>;
  readonly parsed: ParsedCloud;
  readonly sizeBytes: number;
  readonly sha256: string;
  /** commit or abort it */
  readonly pending: PendingBlob;
}

const megabytes = (b: number) => `${Math.round(b / 1e6)} MB`;

/** A parser's rejection as the API's error. */
export function measureError(e: unknown, fileName: string): unknown {
  if (!isMeasureFileError(e)) return e;
  const status = e.code === 'measure.tooManyPoints' ? 413 : 400;
  const where: Record<string, unknown> = { fileName };
  if (e.line !== undefined) where.line = e.line;
  if (e.byteOffset !== undefined) where.byteOffset = e.byteOffset;
  return new AppError(status, e.code, `${fileName}: ${e.message}`, where);
}

function consumeFile(
  stream: Readable & { truncated?: boolean },
  fileName: string,
  limits: UploadLimits,
  store: BlobStore,
): Promise<{ parsed: ParsedCloud; size: number; sha256: string; pending: PendingBlob }> {
  let parser: MeasureFileParser;
  try {
    parser = new MeasureFileParser({ fileName, keep: false, maxPoints: limits.maxPoints });
  } catch (e) {
    stream.resume();
    return Promise.reject(measureError(e, fileName));
  }
  return store.begin().then(
    (pending) =>
      new Promise((resolve, reject) => {
        const hash = createHash('sha256');
        let size = 0;
        let failed = false;
        let lastWrite: Promise<void> = Promise.resolve();
        const fail = (e: unknown) => {
          if (failed) return;
          failed = true;
          // keep reading (and dropping) the rest, so the request completes and the answer reaches the client
          stream.resume();
          void pending.abort().finally(() => reject(measureError(e, fileName)));
        };
        stream.on('data', (chunk: Buffer) => {
          if (failed) return;
          size += chunk.length;
          hash.update(chunk);
          try {
            parser.push(new Uint8Array(chunk.buffer, chunk.byteOffset, chunk.byteLength));
          } catch (e) {
            fail(e);
            return;
          }
          stream.pause();
          lastWrite = pending.write(chunk).then(
            () => {
              if (!failed) stream.resume();
            },
            (e) => fail(e),
          );
        });
        stream.on('error', fail);
        stream.on('end', () => {
          void lastWrite.then(() => {
            if (failed) return;
            if (stream.truncated) {
              fail(new AppError(413, 'too_large', `${fileName} is larger than ${megabytes(limits.maxBytes)}, the most one upload may be. Thin or crop the scan and upload again.`, { fileName, limitBytes: limits.maxBytes }));
              return;
            }
            try {
              resolve({ parsed: parser.end(), size, sha256: hash.digest('hex'), pending });
            } catch (e) {
              fail(e);
            }
          });
        });
      }),
  );
}

/** Reads the multipart request: exactly one file (field "file") and small text fields. */
export function receiveUpload(request: Request, limits: UploadLimits, store: BlobStore): Promise<ReceivedUpload> {
  const type = request.headers.get('content-type') ?? '';
  if (!/^multipart\/form-data/i.test(type)) {
    return Promise.reject(new AppError(400, 'not_multipart', 'Send the measurement as multipart/form-data: a "file" field with the file and a "units" field (mm or in).'));
  }
  const length = Number(request.headers.get('content-length'));
  if (Number.isFinite(length) && length > limits.maxBytes + 1_000_000) {
    return Promise.reject(new AppError(413, 'too_large', `The upload is ${megabytes(length)}; the most one upload may be is ${megabytes(limits.maxBytes)}. Thin or crop the scan and upload again.`, { limitBytes: limits.maxBytes }));
  }
  if (!request.body) return Promise.reject(new AppError(400, 'no_file', 'The request has no body; attach the measurement file as the "file" field.'));

  return new Promise<ReceivedUpload>((resolve, reject) => {
    const fields: Record<string, string> = {};
    let task: Promise<Awaited<ReturnType<typeof consumeFile>>> | null = null;
    let fileName = '';
    let failure: unknown = null;
    let bb: busboy.Busboy;
    try {
      bb = busboy({ headers: { 'content-type': type }, limits: { fileSize: limits.maxBytes, files: 1, fields: 20, fieldSize: 10_000, parts: 30 } });
    } catch (e) {
      reject(new AppError(400, 'not_multipart', `The multipart body cannot be read: ${(e as Error).message}`));
      return;
    }
    bb.on('field', (name, value) => {
      fields[name] = value;
    });
    bb.on('file', (name, stream, info) => {
      if (name !== 'file' || task) {
        stream.resume();
        return;
      }
      fileName = (info.filename || 'upload').replace(/[\\/]/g, '_').slice(0, 255);
      task = consumeFile(stream, fileName, limits, store);
      task.catch((e) => (failure ??= e));
    });
    bb.on('filesLimit', () => (failure ??= new AppError(400, 'one_file', 'Upload one file at a time.')));
    bb.on('error', (e) => (failure ??= new AppError(400, 'bad_multipart', `The upload was cut off or is not valid multipart data: ${(e as Error).message}`)));
    bb.on('close', () => {
      void (async () => {
        if (!task) {
          reject(failure ?? new AppError(400, 'no_file', 'No file in the upload; attach the measurement file as the "file" field.'));
          return;
        }
        try {
          const done = await task;
          if (failure) {
            await done.pending.abort();
            reject(failure);
            return;
          }
          resolve({ fileName, fields, parsed: done.parsed, sizeBytes: done.size, sha256: done.sha256, pending: done.pending });
        } catch (e) {
          reject(failure ?? e);
        }
      })();
    });
    const source = Readable.fromWeb(request.body as import('node:stream/web').ReadableStream<Uint8Array>);
    source.on('error', (e) => {
      failure ??= new AppError(400, 'upload_interrupted', `The upload was interrupted: ${e.message}. Nothing was saved.`);
      bb.destroy(e);
      if (!task) reject(failure);
    });
    source.pipe(bb);
  });
}
