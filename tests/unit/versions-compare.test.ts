// Comparing two versions' bodies (common practice for text differences: steps aligned by their
// step ids, words compared within a step) and writing text safely into LaTeX.
import { describe, expect, test } from 'vitest';
import type { DocNode } from '../../flow/document';
import { compareBodies } from '../../server/versions/compare';
import { escapeLatex, messageLatex } from '../../server/versions/latex';

const paragraph = (stepId: string, text: string): DocNode => ({ type: 'paragraph', attrs: { stepId }, content: [{ type: 'text', text }] });
const side = (content: DocNode[], verdicts: [string, string, 'holds' | 'fails'][] = []) => ({
  meta: { id: 'x', label: 'x', number: 1, locked: false, createdAt: null },
  body: { type: 'doc', content },
  verdicts: new Map(verdicts.map(([stepId, claimId, status]) => [stepId, { claimId, status }])),
});

describe('comparing two versions', () => {
  test('a step edited, one added, one removed and one moved are each marked so', () => {
    const before = side([paragraph('a', 'The flow at one loop.'), paragraph('b', 'A remark.'), paragraph('c', 'Gone soon.'), paragraph('d', 'Last.')]);
    const after = side([paragraph('d', 'Last.'), paragraph('a', 'The flow at two loops.'), paragraph('b', 'A remark.'), paragraph('e', 'New.')]);
    const result = compareBodies(before, after);
    const change = Object.fromEntries(result.steps.map((s) => [s.stepId, s.change]));
    expect(change).toEqual({ a: 'changed', b: 'same', c: 'removed', d: 'moved', e: 'added' });
    const edited = result.steps.find((s) => s.stepId === 'a')!;
    expect(edited.parts!.filter((p) => p.removed).map((p) => p.value)).toEqual(['one', 'loop']);
    expect(edited.parts!.filter((p) => p.added).map((p) => p.value)).toEqual(['two', 'loops']);
    expect(result.counts).toMatchObject({ changed: 1, added: 1, removed: 1, moved: 1 });
  });

  test('a claim whose verdict changed is called out, one that kept it is not', () => {
    const before = side([paragraph('k', 'claim'), paragraph('m', 'claim')], [['k', 'fixed-point', 'fails'], ['m', 'stability', 'holds']]);
    const after = side([paragraph('k', 'claim'), paragraph('m', 'claim')], [['k', 'fixed-point', 'holds'], ['m', 'stability', 'holds']]);
    const result = compareBodies(before, after);
    expect(result.claims.filter((c) => c.verdictChanged)).toEqual([{ stepId: 'k', claimId: 'fixed-point', before: 'fails', after: 'holds', verdictChanged: true }]);
  });
});

describe('text in the LaTeX article', () => {
  test('LaTeX specials and characters outside the text fonts are written literally', () => {
    expect(escapeLatex('a_b & 50% #1 {x} ~y^2 \\ $5')).toBe('a\\_b \\& 50\\% \\#1 \\{x\\} \\textasciitilde{}y\\textasciicircum{}2 \\textbackslash{} \\$5');
    expect(escapeLatex('ε → 0, Wilson–Fisher, naïve')).toBe('\\ensuremath{\\varepsilon} \\ensuremath{\\to} 0, Wilson--Fisher, naïve');
    expect(escapeLatex('中')).toBe('\\texttt{U+4E2D}');
  });

  test('a verdict message raises its exponents whole', () => {
    expect(messageLatex('the residual scales as eps^3.01, expected eps^3')).toBe('the residual scales as eps\\textsuperscript{3.01}, expected eps\\textsuperscript{3}');
    expect(messageLatex('O(x^(k+1)) at 50%')).toBe('O(x\\textsuperscript{k+1}) at 50\\%');
  });
});
