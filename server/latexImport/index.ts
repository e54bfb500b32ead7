// Importing a .tex file as a new derivation: the file is checked (size, text), read into steps,
// the derivation is created and its first document written through the collaboration service,
// so that it opens in the editor like any other. If writing the document fails, the derivation is
// taken away again: an import is all or nothing.
import { randomUUID } from 'node:crypto';
import { ApiError, badRequest } from '../api/errors';
import { collab } from '../collab';
import { createDerivation, deleteDerivation } from '../derivations';
import { describeWhere, leftOutBlocks, toProseMirror, toYjsUpdate } from './document';
import { readLatex, type LeftOut } from './parse';

export const MAX_LATEX_BYTES = 2 * 1024 * 1024;
const MAX_TITLE = 200;

export interface ImportResult {
  derivationId: string;
  title: string;
  steps: number;
  /** What was not imported as it stood, each with its lines; also written at the end of the derivation. */
  leftOut: (LeftOut & { where: string })[];
}

/** The file's text: UTF-8, or Latin-1 for older files (which is then said); never binary. */
export function latexText(bytes: Uint8Array): { text: string; latin1: boolean } {
  if (bytes.byteLength === 0) throw badRequest('The file is empty.', 'file');
  if (bytes.byteLength > MAX_LATEX_BYTES) throw badRequest(`The file is over the limit of 2 MB for a LaTeX import.`, 'file');
  if (bytes[0] === 0x25 && bytes[1] === 0x50 && bytes[2] === 0x44 && bytes[3] === 0x46) {
    throw badRequest('This is a PDF, not a LaTeX source file: import the .tex file it was made from.', 'file');
  }
  const nul = bytes.indexOf(0);
  if (nul >= 0) throw badRequest(`This is not a LaTeX source file: it contains binary data (a NUL byte at byte ${nul + 1}).`, 'file');
  try {
    const text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
    return { text: text.charCodeAt(0) === 0xfeff ? text.slice(1) : text, latin1: false };
  } catch {
    return { text: new TextDecoder('windows-1252').decode(bytes), latin1: true };
  }
}

function titleFrom(fileName: string): string {
  return fileName.replace(/\.(tex|ltx|latex)$/i, '').replace(/[_-]+/g, ' ').trim() || 'Imported derivation';
}

export async function importLatex(
  groupId: string,
  userId: string,
  file: { name: string; bytes: Uint8Array },
  requestedTitle?: string,
): Promise<ImportResult> {
  const { text, latin1 } = latexText(file.bytes);
  let read;
  try {
    read = readLatex(text);
  } catch (error) {
    throw badRequest(`The file could not be read as LaTeX: ${error instanceof Error ? error.message.split('\n')[0] : 'unknown error'}.`, 'file');
  }
  if (read.blocks.length === 0) throw badRequest('Nothing in this file could be imported: it has no text, headings or equations.', 'file');
  const leftOut = latin1
    ? [{ what: 'text encoding', lines: [], count: 1, detail: 'the file is not UTF-8 and was read as Latin-1 (Windows-1252); check accented letters' }, ...read.leftOut]
    : read.leftOut;

  const title = (requestedTitle?.trim() || read.title || titleFrom(file.name)).slice(0, MAX_TITLE);
  const derivation = await createDerivation(groupId, userId, title);
  const doc = toProseMirror([...read.blocks, ...leftOutBlocks(file.name, leftOut)], randomUUID);
  try {
    await collab().applyUpdate(derivation.id, toYjsUpdate(doc), { userId });
  } catch (error) {
    await deleteDerivation(derivation.id).catch(() => undefined);
    if ((error as { code?: unknown }).code === 'DOCUMENT_TOO_LARGE') throw new ApiError(400, 'The imported document is larger than a derivation may be.', 'file');
    throw error;
  }
  return {
    derivationId: derivation.id,
    title: derivation.title,
    steps: doc.content?.length ?? 0,
    leftOut: leftOut.map((item) => ({ ...item, where: describeWhere(item) })),
  };
}
