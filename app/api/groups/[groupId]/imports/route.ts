import { z } from 'zod';
import { idSchema } from '@/app/_lib/schemas';
import { badRequest } from '@/server/api/errors';
import { groupRoute } from '@/server/api/route';
import { readCappedForm } from '@/server/datasets/upload';
import { importLatex, MAX_LATEX_BYTES } from '@/server/latexImport';

const params = z.object({ groupId: idSchema });
const FORM_OVERHEAD = 64 * 1024;

/** A .tex file (multipart field "file", optional "title") becomes a new derivation of the group. */
export const POST = groupRoute({ params, action: 'createDerivation', status: 201 }, async ({ req, params, user }) => {
  const form = await readCappedForm(req, MAX_LATEX_BYTES + FORM_OVERHEAD, 'the LaTeX file');
  if (!form) throw badRequest('The file is over the limit of 2 MB for a LaTeX import.', 'file');
  const file = form.get('file');
  if (!(file instanceof Blob)) throw badRequest('Choose a .tex file to import.', 'file');
  const title = form.get('title');
  if (typeof title === 'string' && title.trim().length > 200) throw badRequest('Keep the title to at most 200 characters.', 'title');
  const result = await importLatex(
    params.groupId,
    user.id,
    { name: file instanceof File ? file.name : 'import.tex', bytes: new Uint8Array(await file.arrayBuffer()) },
    typeof title === 'string' ? title : undefined,
  );
  return Response.json(result, { status: 201, headers: { 'cache-control': 'no-store' } });
});
