import 'server-only';
import { Readable } from 'node:stream';
import Busboy from 'busboy';
import type { ReadTraceOptions } from '@/analysis/trace';
import { scanTrace, TraceFormatError } from '@/analysis/trace';
import type { TraceScan } from '@/analysis/trace';
import type { ErrorPlace } from '../errors';

export const MIB = 1024 * 1024;
/** The largest trace accepted (the reader's own default limit). */
export const MAX_UPLOAD_BYTES = 200 * MIB;

/** A refusal of the upload, already in the API's terms. */
export class UploadRefused extends Error {
  constructor(
    readonly code: 'too_large:upload' | 'unsupported_media_type:upload' | 'unprocessable:field' | 'unprocessable:trace' | 'bad_request:input',
    message: string,
    readonly place: ErrorPlace = {},
  ) {
    super(message);
  }
}

export type Received = { fields: Record<string, string>; fileName: string; scan: TraceScan };

/**
 * Streams a multipart upload through busboy: the `trace` file's bytes go to `sink` as they come
 * (the caller stores them inside its transaction) while scanTrace checks every row, so the file is
 * never held whole. Fields may come before or after the file. Throws UploadRefused for a body
 * that is not multipart, too large, without a trace, or a trace that breaks the format.
 */
export async function receiveUpload(
  request: Request,
  opts: { maxBytes: number; sink: { begin(fileName: string): Promise<void>; write(chunk: Buffer): Promise<void> }; traceOptions?: (fields: Record<string, string>) => ReadTraceOptions },
): Promise<Received> {
  const type = request.headers.get('content-type') ?? '';
  if (!/^multipart\/form-data\b/i.test(type)) throw new UploadRefused('unsupported_media_type:upload', `expected multipart/form-data, got ${type || 'no Content-Type'}`);
  if (!request.body) throw new UploadRefused('unprocessable:field', 'the upload has no file field "trace"', { field: 'trace' });
  let bb: Busboy.Busboy;
  try {
    bb = Busboy({ headers: { 'content-type': type }, limits: { fileSize: opts.maxBytes, files: 1, fields: 20, fieldSize: 4096 }, defParamCharset: 'utf8' });
  } catch (err) {
    throw new UploadRefused('unsupported_media_type:upload', `the multipart body cannot be read: ${err instanceof Error ? err.message : String(err)}`);
  }
  const body = Readable.fromWeb(request.body as import('node:stream/web').ReadableStream);
  const fields: Record<string, string> = {};
  let file: Promise<{ fileName: string; scan: TraceScan }> | undefined;
  let failFast: (err: unknown) => void = () => undefined;
  const fileFailed = new Promise<never>((_, reject) => {
    failFast = reject;
  });
  fileFailed.catch(() => undefined);

  const closed = new Promise<void>((resolve, reject) => {
    bb.on('field', (name, value) => {
      fields[name] = value;
    });
    bb.on('file', (name, stream, info) => {
      if (name !== 'trace' || file) {
        stream.resume();
        return;
      }
      const fileName = info.filename || 'trace.csv';
      file = (async () => {
        await opts.sink.begin(fileName);
        const chunks = (async function* () {
          for await (const chunk of stream as AsyncIterable<Buffer>) {
            await opts.sink.write(chunk);
            yield chunk;
          }
          // busboy's size limit is not an error: it stops the stream and sets `truncated`.
          if ((stream as { truncated?: boolean }).truncated) throw new UploadRefused('too_large:upload', `the file is larger than the upload limit of ${opts.maxBytes / MIB} MiB`);
        })();
        const scan = await scanTrace(chunks, { ...opts.traceOptions?.(fields), fileName, maxBytes: opts.maxBytes + 1 });
        return { fileName, scan };
      })();
      file.catch(failFast);
    });
    bb.on('close', () => resolve());
    bb.on('error', (err) => reject(new UploadRefused('bad_request:input', `the multipart body is malformed: ${err instanceof Error ? err.message : String(err)}`)));
  });
  closed.catch(() => undefined);
  body.on('error', () => undefined);
  body.pipe(bb);
  try {
    // A bad row refuses the upload at once, without waiting for the rest of the body.
    await Promise.race([closed, fileFailed]);
    const done = file ? await file : undefined;
    if (!done) throw new UploadRefused('unprocessable:field', 'the upload has no file field "trace"', { field: 'trace' });
    return { fields, ...done };
  } catch (err) {
    // Answer now; read and drop the rest of the body so the client sees the answer, not a reset.
    body.unpipe(bb);
    body.resume();
    if (err instanceof TraceFormatError) {
      if (err.code === 'size_limit') throw new UploadRefused('too_large:upload', err.message);
      throw new UploadRefused('unprocessable:trace', err.message, { line: err.line, column: err.columnNumber, columnName: err.column });
    }
    throw err;
  }
}
