// Reading .tex files into a derivation's steps (server/latexImport): sections, paragraphs, inline
// and display math, equation / align and their kin, lists, the author's macros, and everything
// left out listed with its lines. The document produced is checked against the editor's own schema,
// and its Yjs form read back the way the editor's binding reads it. The LaTeX constructs and what
// they mean are the standard ones (L. Lamport, LaTeX: A Document Preparation System; amsmath's guide).
import { getSchema } from '@tiptap/core';
import { Node } from '@tiptap/pm/model';
import StarterKit from '@tiptap/starter-kit';
import { yXmlFragmentToProsemirrorJSON } from 'y-prosemirror';
import katex from 'katex';
import { describe, expect, test } from 'vitest';
import * as Y from 'yjs';
import { MathDisplay, MathInline } from '../../editor/math';
import { StepIds } from '../../editor/stepIds';
import { leftOutBlocks, toProseMirror, toYjsUpdate } from '../../server/latexImport/document';
import { expandMacros } from '../../server/latexImport/macros';
import { readLatex, type Block, type Inline } from '../../server/latexImport/parse';

const paper = [
  '\\documentclass{article}', //  1
  '\\usepackage{amsmath}', //  2
  '\\newcommand{\\eps}{\\epsilon}', //  3
  '\\newcommand{\\abs}[1]{\\left|#1\\right|}', //  4
  '\\title{Chains in four dimensions}', //  5
  '\\begin{document}', //  6
  '\\maketitle', //  7
  '\\section{The flow}', //  8
  'We write $\\beta(g) = -\\eps g + b g^2$ and', //  9
  '\\emph{find} the ``fixed point\'\' --- see \\cite{wilson}.', // 10
  '', // 11
  'A second paragraph with \\textbf{bold} words.', // 12
  '\\begin{equation}', // 13
  '  g^* = \\frac{\\eps}{b} \\label{eq:fp}', // 14
  '\\end{equation}', // 15
  '\\[ \\abs{x} = 1 \\]', // 16
  '\\begin{align}', // 17
  '  a &= b \\\\', // 18
  '  c &= d', // 19
  '\\end{align}', // 20
  '\\subsection{Details} Some \\weird{kept words} here.', // 21
  '\\begin{figure}\\includegraphics{flow.png}\\end{figure}', // 22
  '\\begin{itemize}\\item one $x$ \\item two\\end{itemize}', // 23
  '$$ y = 2 $$ and \\weird again.', // 24
  '\\end{document}', // 25
].join('\n');

const text = (content: Inline[]) => content.map((i) => (i.kind === 'text' ? i.text : `$${i.latex}$`)).join('');

describe('reading a paper', () => {
  const read = readLatex(paper);
  const kinds = read.blocks.map((b) => (b.kind === 'heading' ? `h${b.level}` : b.kind));

  test('the title, sections and subsections become headings, one level apart, in order', () => {
    expect(read.title).toBe('Chains in four dimensions');
    const headings = read.blocks.filter((b): b is Extract<Block, { kind: 'heading' }> => b.kind === 'heading');
    expect(headings.map((h) => [h.level, text(h.content)])).toEqual([
      [1, 'Chains in four dimensions'],
      [2, 'The flow'],
      [3, 'Details'],
    ]);
    expect(kinds).toEqual(['h1', 'h2', 'paragraph', 'paragraph', 'math', 'math', 'math', 'h3', 'paragraph', 'list', 'math', 'paragraph']);
  });

  test('paragraphs keep their words, emphasis and typography, with inline math as LaTeX and macros expanded', () => {
    const first = read.blocks[2] as Extract<Block, { kind: 'paragraph' }>;
    expect(text(first.content)).toBe('We write $\\beta(g) = -\\epsilon g + b g^2$ and find the “fixed point” — see [wilson].');
    expect(first.content.find((i) => i.kind === 'text' && i.text === 'find')).toMatchObject({ marks: [{ type: 'italic' }] });
    const second = read.blocks[3] as Extract<Block, { kind: 'paragraph' }>;
    expect(second.content.find((i) => i.kind === 'text' && i.text === 'bold')).toMatchObject({ marks: [{ type: 'bold' }] });
  });

  test('equation, \\[ \\], align and $$ $$ become display math KaTeX can typeset, labels taken out', () => {
    const maths = read.blocks.filter((b): b is Extract<Block, { kind: 'math' }> => b.kind === 'math').map((b) => b.latex);
    expect(maths).toEqual([
      'g^* = \\frac{\\epsilon}{b}',
      '\\left|x\\right| = 1',
      '\\begin{aligned}\na &= b \\\\\n  c &= d\n\\end{aligned}',
      'y = 2',
    ]);
    for (const latex of maths) expect(() => katex.renderToString(latex, { displayMode: true, throwOnError: true })).not.toThrow();
  });

  test('lists stay lists, one item per \\item', () => {
    const list = read.blocks.find((b): b is Extract<Block, { kind: 'list' }> => b.kind === 'list')!;
    expect(list.ordered).toBe(false);
    expect(list.items.map((item) => item.map((b) => (b.kind === 'paragraph' ? text(b.content) : b.kind)))).toEqual([['one $x$'], ['two']]);
  });

  test('what was not imported is listed with its lines: unknown commands, the figure, labels, citations, the preamble', () => {
    const byWhat = new Map(read.leftOut.map((l) => [l.what, l]));
    expect(byWhat.get('\\weird')).toMatchObject({ lines: [21, 24], count: 2 });
    expect(byWhat.get('\\begin{figure}')).toMatchObject({ lines: [22] });
    expect(byWhat.get('\\label in equations')?.count).toBe(1);
    expect(byWhat.get('citations')).toMatchObject({ lines: [10] });
    expect(byWhat.get('the preamble (\\documentclass, \\usepackage)')?.count).toBe(2);
    // An unknown command's own words are kept.
    expect(text((read.blocks[8] as Extract<Block, { kind: 'paragraph' }>).content)).toBe('Some kept words here.');
  });
});

describe('the constructs one at a time', () => {
  test('a fragment without \\begin{document} is read whole; \\( \\) is inline math', () => {
    const read = readLatex('Take \\(x^{2}\\) small.\n\nNext paragraph.');
    expect(read.blocks.map((b) => (b.kind === 'paragraph' ? text(b.content) : b.kind))).toEqual(['Take $x^{2}$ small.', 'Next paragraph.']);
  });

  test('gather, multline, eqnarray and alignat take KaTeX forms that typeset', () => {
    const read = readLatex(
      '\\begin{gather} a \\\\ b \\end{gather}\\begin{multline} a \\\\ b \\end{multline}' +
        '\\begin{eqnarray} x &=& y \\end{eqnarray}\\begin{alignat}{2} a &= b & c &= d \\end{alignat}',
    );
    const maths = read.blocks.map((b) => (b.kind === 'math' ? b.latex : ''));
    expect(maths[0]).toMatch(/^\\begin\{gathered\}/);
    expect(maths[1]).toMatch(/^\\begin\{gathered\}/);
    expect(maths[2]).toBe('\\begin{aligned}\nx &= y\n\\end{aligned}');
    expect(maths[3]).toMatch(/^\\begin\{alignedat\}\{2\}/);
    for (const latex of maths) expect(() => katex.renderToString(latex, { displayMode: true, throwOnError: true })).not.toThrow();
    expect(read.leftOut.map((l) => l.what)).toContain('\\begin{multline}');
  });

  test('theorems and proofs keep their words behind a bold name; an unknown environment keeps its text and is listed', () => {
    const read = readLatex('\\begin{theorem}[Main] It holds.\\end{theorem}\n\\begin{mybox}Inside.\\end{mybox}');
    expect(read.blocks.map((b) => (b.kind === 'paragraph' ? text(b.content) : b.kind))).toEqual(['Theorem (Main). It holds.', 'Inside.']);
    expect(read.leftOut.find((l) => l.what === '\\begin{mybox}')?.lines).toEqual([2]);
  });

  test('accents and escaped characters become the letters and signs they stand for', () => {
    const read = readLatex('M\\"uller, Erd\\H{o}s, na\\"{\\i}ve, 5\\% of \\$3 \\& more\\ldots');
    expect(text((read.blocks[0] as Extract<Block, { kind: 'paragraph' }>).content)).toBe('Müller, Erdős, naïve, 5% of $3 & more…');
  });

  test('comments are left out and counted, a table and an \\input are listed with their lines', () => {
    const read = readLatex('Text % note\nmore\n\\begin{table}x\\end{table}\n\\input{appendix}');
    expect(text((read.blocks[0] as Extract<Block, { kind: 'paragraph' }>).content)).toBe('Text more');
    expect(read.leftOut.find((l) => l.what === 'comments (% …)')).toMatchObject({ count: 1, lines: [1] });
    expect(read.leftOut.find((l) => l.what === '\\begin{table}')?.lines).toEqual([3]);
    expect(read.leftOut.find((l) => l.what === '\\input{appendix}')?.lines).toEqual([4]);
  });

  test('the author’s macros expand with arguments, an optional default and nesting, in bounded passes', () => {
    const macros = new Map([
      ['abs', { name: 'abs', argumentCount: 1, optionalDefault: null, body: '\\left|#1\\right|' }],
      ['pt', { name: 'pt', argumentCount: 2, optionalDefault: 'x', body: '\\partial_{#1} #2' }],
      ['eps', { name: 'eps', argumentCount: 0, optionalDefault: null, body: '\\epsilon' }],
      ['loop', { name: 'loop', argumentCount: 0, optionalDefault: null, body: '\\loop' }],
    ]);
    expect(expandMacros('\\abs{\\eps g}', macros)).toBe('\\left|\\epsilon g\\right|');
    expect(expandMacros('\\pt{f} + \\pt[t]{g}', macros)).toBe('\\partial_{x} f + \\partial_{t} g');
    expect(expandMacros('\\epsilon \\epsx', macros)).toBe('\\epsilon \\epsx'); // not a use of \eps
    expect(expandMacros('\\loop', macros)).toBe('\\loop'); // stops: never hangs
  });
});

describe('the document the editor opens', () => {
  // The editor's own nodes: StarterKit as the editor configures it, its step ids and its math.
  const editorSchema = () =>
    getSchema([StarterKit.configure({ undoRedo: false, trailingNode: false, heading: { levels: [1, 2, 3] } }), StepIds, MathInline, MathDisplay]);

  test('fits the editor’s schema, with a unique step id on every top-level block, and the note of what was left out at the end', () => {
    const read = readLatex(paper);
    let n = 0;
    const doc = toProseMirror([...read.blocks, ...leftOutBlocks('paper.tex', read.leftOut)], () => `step-${++n}`);
    const schema = editorSchema();
    const node = Node.fromJSON(schema, doc);
    expect(() => node.check()).not.toThrow();
    const ids: unknown[] = [];
    node.forEach((block) => ids.push(block.attrs.stepId));
    expect(new Set(ids).size).toBe(node.childCount);
    expect(ids.every((id) => typeof id === 'string')).toBe(true);
    const last = doc.content!.at(-1)!;
    expect(last.type).toBe('bulletList');
    expect(JSON.stringify(last)).toContain('\\\\begin{figure}');
    expect(JSON.stringify(last)).toContain('line 22');
    expect(doc.content!.at(-2)).toMatchObject({ type: 'heading', content: [{ text: 'Not imported from paper.tex' }] });
    expect(doc.content!.some((b) => b.type === 'mathDisplay')).toBe(true);
  });

  test('its Yjs form, read back the way the editor’s binding reads it, is the same document', () => {
    const read = readLatex(paper);
    let n = 0;
    const doc = toProseMirror(read.blocks, () => `step-${++n}`);
    const schema = editorSchema();
    const ydoc = new Y.Doc();
    Y.applyUpdate(ydoc, toYjsUpdate(doc));
    const back = Node.fromJSON(schema, yXmlFragmentToProsemirrorJSON(ydoc.getXmlFragment('body')));
    expect(back.eq(Node.fromJSON(schema, doc))).toBe(true);
  });
});
