// Importing a .tex file through the real route of a running server: a new derivation whose working
// copy (read through the collaboration socket, as an editor would) holds the headings, paragraphs
// and equations as steps and ends with what was not imported; the roles, the size limit, binary
// files and a taken title are refused, and nothing is created then.
import { yXmlFragmentToProsemirrorJSON } from 'y-prosemirror';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { demoSessions, startServer, type DemoSessions, type StartedServer } from '../helpers';
import { connectClient } from './collabClients';

interface Imported {
  derivationId: string;
  title: string;
  steps: number;
  leftOut: { what: string; lines: number[]; where: string; detail: string }[];
  error?: string;
  field?: string;
}
interface PmNode {
  type: string;
  attrs?: Record<string, unknown>;
  content?: PmNode[];
  text?: string;
}

let server: StartedServer;
let demo: DemoSessions;

const tex = [
  '\\documentclass{article}',
  '\\newcommand{\\eps}{\\epsilon}',
  '\\title{Walks at the upper critical dimension}',
  '\\begin{document}',
  '\\section{Flow}',
  'The coupling obeys $\\dot g = -\\eps g + b g^2$.',
  '\\begin{equation}',
  'g^* = \\eps / b',
  '\\end{equation}',
  '\\begin{figure}\\includegraphics{walk.pdf}\\end{figure}',
  'Then \\mystery{this} follows.',
  '\\end{document}',
].join('\n');

async function importFile(content: string | Uint8Array<ArrayBuffer>, options: { cookie?: string; name?: string; title?: string } = {}) {
  const form = new FormData();
  form.set('file', new Blob([content]), options.name ?? 'walks.tex');
  if (options.title) form.set('title', options.title);
  const response = await fetch(`${server.url}/api/groups/${demo.groupId}/imports`, {
    method: 'POST',
    headers: { cookie: options.cookie ?? demo.cookies.author },
    body: form,
  });
  return { status: response.status, body: (await response.json()) as Imported };
}

const titles = async () =>
  (await demo.as.lead.get<{ derivations: { title: string }[] }>(`/api/groups/${demo.groupId}/derivations`)).body.derivations.map((d) => d.title);

async function workingCopy(derivationId: string, cookie: string): Promise<PmNode> {
  const client = connectClient(server.url, derivationId, { cookie, origin: server.url });
  try {
    await client.synced();
    return yXmlFragmentToProsemirrorJSON(client.doc.getXmlFragment('body')) as PmNode;
  } finally {
    client.destroy();
  }
}

const textOf = (node: PmNode): string => node.text ?? (node.content ?? []).map(textOf).join('');

beforeAll(async () => {
  server = await startServer({ demo: true });
  demo = await demoSessions(server.url);
});

afterAll(async () => {
  await server?.stop();
});

describe('importing a LaTeX file', () => {
  test('an author imports a .tex file; the new derivation opens with its steps and a list of what was left out', async () => {
    const imported = await importFile(tex);
    expect(imported.status).toBe(201);
    expect(imported.body.title).toBe('Walks at the upper critical dimension');
    expect(await titles()).toContain('Walks at the upper critical dimension');
    expect(imported.body.leftOut.find((l) => l.what === '\\begin{figure}')?.lines).toEqual([10]);
    expect(imported.body.leftOut.find((l) => l.what === '\\mystery')?.lines).toEqual([11]);

    const doc = await workingCopy(imported.body.derivationId, demo.cookies.reader);
    const blocks = doc.content ?? [];
    // The file prints no \\maketitle: its title names the derivation, its section is the first heading.
    expect(blocks.map((b) => b.type)).toEqual(['heading', 'paragraph', 'mathDisplay', 'paragraph', 'heading', 'bulletList']);
    expect(blocks.length).toBe(imported.body.steps);
    expect(blocks[0]).toMatchObject({ attrs: { level: 1 } });
    expect(textOf(blocks[0]!)).toBe('Flow');
    const inline = blocks[1]!.content!.find((n) => n.type === 'mathInline')!;
    expect(textOf(inline)).toBe('\\dot g = -\\epsilon g + b g^2');
    expect(textOf(blocks[2]!)).toBe('g^* = \\epsilon / b');
    expect(textOf(blocks[3]!)).toBe('Then this follows.');
    expect(textOf(blocks[4]!)).toBe('Not imported from walks.tex');
    expect(textOf(blocks[5]!)).toContain('\\begin{figure} (line 10)');
    const stepIds = blocks.map((b) => b.attrs?.stepId);
    expect(new Set(stepIds).size).toBe(blocks.length);
    expect(stepIds.every((id) => typeof id === 'string' && id.length > 0)).toBe(true);
  });

  test('a title given with the upload wins over the file’s \\title, and a taken title is refused with nothing created', async () => {
    const named = await importFile(tex, { title: 'My own name for it' });
    expect(named.status).toBe(201);
    expect(named.body.title).toBe('My own name for it');
    const before = await titles();
    const again = await importFile(tex, { title: 'MY OWN NAME FOR IT' });
    expect(again.status).toBe(409);
    expect(again.body.field).toBe('title');
    expect(await titles()).toEqual(before);
  });

  test('a reviewer and a reader may not import; a binary file, an empty one and a file over 2 MB are refused', async () => {
    const before = await titles();
    for (const role of ['reviewer', 'reader'] as const) {
      const refused = await importFile(tex, { cookie: demo.cookies[role], title: `By the ${role}` });
      expect(refused.status).toBe(403);
    }
    const binary = await importFile(new Uint8Array([0x25, 0x50, 0x44, 0x46, 0x2d, 0x31, 0, 0, 7]), { name: 'paper.tex' });
    expect(binary.status).toBe(400);
    expect(binary.body.error).toMatch(/PDF, not a LaTeX source file/);
    const empty = await importFile('', { name: 'empty.tex' });
    expect(empty.status).toBe(400);
    const big = await importFile('%'.repeat(2 * 1024 * 1024 + 10) + '\nText.', { name: 'big.tex' });
    expect(big.status).toBe(400);
    expect(big.body.error).toMatch(/over the limit of 2 MB/);
    const blank = await importFile('% only a comment\n', { name: 'blank.tex', title: 'Blank' });
    expect(blank.status).toBe(400);
    expect(blank.body.error).toMatch(/Nothing in this file could be imported/);
    expect(await titles()).toEqual(before);
  });
});
