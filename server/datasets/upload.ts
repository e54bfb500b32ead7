// Reading an upload request: a multipart form with the file and a JSON description ("meta"). The
// body is read through a byte counter, so an oversized upload is refused without being buffered
// whole; what the route answers for a refused file is built here too.
import { badRequest } from '../api/errors';
import { datasetMetaSchema, type DatasetMeta } from './input';
import { formatBytes, MAX_DATASET_BYTES, type TableIssue } from './table';

/** Room for the form's boundaries and the description beside the file itself. */
const FORM_OVERHEAD_BYTES = 256 * 1024;

export interface DatasetForm {
  meta: DatasetMeta;
  file: { name: string; bytes: Uint8Array };
}

/** The answer for a file that was refused: the first problem as the message, and the whole list. */
export function refusal(status: 400 | 413, issues: TableIssue[], issueCount = issues.length, error?: string): Response {
  const first = issues[0];
  const message = error ?? (first ? `${first.line ? `Line ${first.line}: ` : ''}${first.message}` : 'The file was refused.');
  return Response.json(
    { error: message, field: 'file', issues, issueCount },
    { status, headers: { 'cache-control': 'no-store' } },
  );
}

function tooLarge(bytes: number | null): Response {
  const size = bytes === null ? 'larger than' : `${formatBytes(bytes)}, over`;
  return refusal(413, [{ line: null, column: null, message: `The file is ${size} the limit of ${formatBytes(MAX_DATASET_BYTES)} for a dataset.` }]);
}

function counted(body: ReadableStream<Uint8Array>, limit: number, onOver: () => void): ReadableStream<Uint8Array> {
  const reader = body.getReader();
  let seen = 0;
  return new ReadableStream<Uint8Array>({
    async pull(controller) {
      const { done, value } = await reader.read();
      if (done) {
        controller.close();
        return;
      }
      seen += value.byteLength;
      if (seen > limit) {
        onOver();
        controller.error(new RangeError('upload over the limit'));
        await reader.cancel().catch(() => undefined);
        return;
      }
      controller.enqueue(value);
    },
    cancel(reason) {
      return reader.cancel(reason);
    },
  });
}

/**
 * A multipart form read through a byte counter: null when the body is larger than `limit` bytes
 * (declared or counted), the form otherwise. Shared by every upload route.
 */
export async function readCappedForm(req: Request, limit: number, what = 'the upload'): Promise<FormData | null> {
  const type = req.headers.get('content-type') ?? '';
  if (!type.toLowerCase().startsWith('multipart/form-data')) {
    throw badRequest(`Send ${what} as a form upload (multipart/form-data).`, 'file');
  }
  const declared = Number(req.headers.get('content-length'));
  if (Number.isFinite(declared) && declared > limit) return null;
  if (!req.body) throw badRequest('Choose a file to upload.', 'file');
  let over = false;
  try {
    const body = counted(req.body, limit, () => (over = true));
    return await new Response(body, { headers: { 'content-type': type } }).formData();
  } catch {
    if (over) return null;
    throw badRequest(`${what[0]!.toUpperCase()}${what.slice(1)} could not be read as a form.`, 'file');
  }
}

/** The form's file and validated description, or the Response that refuses it. */
export async function readDatasetForm(req: Request): Promise<DatasetForm | Response> {
  const declared = Number(req.headers.get('content-length'));
  const cap = MAX_DATASET_BYTES + FORM_OVERHEAD_BYTES;
  const form = await readCappedForm(req, cap, 'the dataset');
  if (!form) return tooLarge(Number.isFinite(declared) && declared > cap ? declared : null);

  const file = form.get('file');
  if (!(file instanceof Blob)) throw badRequest('Choose a file to upload.', 'file');
  if (file.size > MAX_DATASET_BYTES) return tooLarge(file.size);

  const rawMeta = form.get('meta');
  let metaJson: unknown;
  try {
    metaJson = typeof rawMeta === 'string' ? JSON.parse(rawMeta) : undefined;
  } catch {
    throw badRequest('The description of the dataset is not valid JSON.', 'meta');
  }
  if (metaJson === undefined) throw badRequest('Describe the dataset: its name, format and columns.', 'meta');
  const parsed = datasetMetaSchema.safeParse(metaJson);
  if (!parsed.success) {
    const first = parsed.error.issues[0];
    throw badRequest(first?.message ?? 'The description of the dataset is not valid.', first?.path.length ? first.path.map(String).join('.') : undefined);
  }
  const name = file instanceof File ? file.name : 'upload';
  return { meta: parsed.data, file: { name, bytes: new Uint8Array(await file.arrayBuffer()) } };
}
