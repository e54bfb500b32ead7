// The live preview under each field of a flow or claim block: TeX of what the solver reads, or the
// solver's own message for a parse error or an unknown symbol, with where it is. Previews are
// typeset by KaTeX in the editor, so every TeX string here must be accepted by KaTeX itself.
import { readFileSync } from 'node:fs';
import katex from 'katex';
import { describe, expect, test } from 'vitest';
import { checkClaims, type ClaimFile } from '@/flow';
import { claimBlockNode, claimFileToBlocks, readDocument, rowNode, type DocNode } from '@/flow/document';
import { numberTex, previewDocument, previewField } from '@/flow/document/preview';

const example = (name: string): ClaimFile => JSON.parse(readFileSync(new URL(`../../flow/examples/${name}.json`, import.meta.url), 'utf8')) as ClaimFile;

let counter = 0;
const nextStepId = () => `preview-${String(++counter).padStart(4, '0')}`;

function field(key: string, text: string): DocNode {
  return text === '' ? { type: 'blockField', attrs: { field: key } } : { type: 'blockField', attrs: { field: key }, content: [{ type: 'text', text }] };
}

function flowBlock(stepId: string, couplings: string, convention: string, rows: [('parameter' | 'beta' | 'rate'), string, string][]): DocNode {
  return {
    type: 'flowBlock',
    attrs: { stepId },
    content: [field('name', ''), field('couplings', couplings), field('convention', convention), ...rows.map(([row, name, value]) => rowNode(row, name, value))],
  };
}

const twoLoop = flowBlock('flow-1', 'g', 'uv', [
  ['parameter', 'n', '0'],
  ['parameter', 'eps', '0.1'],
  ['beta', 'g', '-eps*g + (n+8)/3*g^2 - (3*n+14)/3*g^3'],
  ['rate', 't', '2 - ((n+2)/3*g - 5*(n+2)/18*g^2)'],
]);

function typesets(tex: string): boolean {
  katex.renderToString(tex, { throwOnError: true, strict: 'ignore' });
  return true;
}

describe('a field shows TeX of what the solver reads', () => {
  test('a beta function is typeset with the flow derivative of its convention, eps as epsilon', () => {
    const previews = previewDocument([twoLoop])['flow-1']!;
    const beta = previews['beta[0].value']!;
    expect(beta.message).toBeNull();
    expect(beta.tex).toContain('\\beta_{g} = \\mu\\frac{dg}{d\\mu} = ');
    expect(beta.tex).toContain('\\varepsilon');
    expect(beta.tex!.replace(/\s/g, '')).toContain('\\frac{n+8}{3}\\cdot{g}^{2}');
    expect(typesets(beta.tex!)).toBe(true);
    expect(previews['rate[0].value']!.tex).toContain('\\frac{d\\ln t}{dl} = ');
    expect(previews['parameter[1].value']!.tex).toBe('\\varepsilon = 0.1');
    expect(previews['couplings']!.tex).toBe('g');
  });

  test('numbers in exponent form are written with a power of ten', () => {
    expect(numberTex(1e-8)).toBe('10^{-8}');
    expect(numberTex(2.5e-12)).toBe('2.5 \\times 10^{-12}');
    expect(numberTex(0.25)).toBe('0.25');
    expect(previewField({ syntax: 'number', text: '1e-8' }).tex).toBe('10^{-8}');
  });

  test('every field of the published example files typesets in KaTeX', () => {
    // The example files carry published values (REFERENCES.md); here only their typesetting counts.
    for (const name of ['on-model', 'log-corrections', 'cubic-anisotropy', 'discrete-map']) {
      const imported = claimFileToBlocks(example(name), { stepId: nextStepId });
      if (!imported.ok) throw new Error(name);
      const previews = previewDocument(imported.blocks);
      const all = Object.values(previews).flatMap((block) => Object.entries(block));
      expect(all.length).toBeGreaterThan(10);
      for (const [address, preview] of all) {
        expect(preview.message, `${name} ${address}`).toBeNull();
        if (preview.tex !== null) expect(typesets(preview.tex)).toBe(true);
      }
    }
  });
});

describe('a field with a mistake says what is wrong and where, in the solver\'s words', () => {
  test('an unknown symbol in a beta function names it, its character and what a flow may use', () => {
    const broken = flowBlock('flow-2', 'g', 'uv', [
      ['parameter', 'n', '0'],
      ['parameter', 'eps', '0.1'],
      ['beta', 'g', '-eps*g + (m+8)/3*g^2'],
    ]);
    const preview = previewDocument([broken])['flow-2']!['beta[0].value']!;
    expect(preview.tex).toBeNull();
    expect(preview.message).toBe('Unknown symbol "m" (character 11); a flow expression may use the couplings (g), the parameters (n, eps) and the rate names (none)');
    expect(preview.position).toBe(11);

    // The solver itself says the same when the flow is checked.
    const file: ClaimFile = {
      flow: { couplings: ['g'], parameters: { n: 0, eps: 0.1 }, convention: 'uv', beta: { g: '-eps*g + (m+8)/3*g^2' } },
      claims: [{ id: 'fp', kind: 'fixed-point', near: { g: 0.3 } }],
    };
    const report = checkClaims(file);
    expect(report.claims[0]!.status).toBe('invalid');
    expect(report.claims[0]!.message).toContain('unknown symbol "m" (character 11); a flow expression may use the couplings (g), the parameters (n, eps) and the rate names (none)');
  });

  test('an expression mathjs cannot read says at which character', () => {
    const preview = previewField({ syntax: 'expression', text: '(n+8/3*g^2', allowed: ['n', 'g'] });
    expect(preview.tex).toBeNull();
    expect(preview.message).toMatch(/^Cannot read "\(n\+8\/3\*g\^2": .*parenthesis.* at character 11$/i);
    expect(preview.position).toBe(11);
  });

  test('a product written like a call gets the hint to write a product', () => {
    const preview = previewField({ syntax: 'expression', text: 'g(1-g)', allowed: ['g'] });
    expect(preview.message).toContain('write g*(...)');
  });

  test('a claim field is read against the flow it is bound to', () => {
    const claim = claimBlockNode({ kind: 'fixed-point', near: { u: '3*eps/(n+8)' }, value: { g: '3*eps/(n+9) + delta' } }, { stepId: 'claim-1' });
    const log = claimBlockNode({ kind: 'log-exponent', scaling: 'tau', observable: 'chi', start: { g: 0.3 }, value: '1/4' }, { stepId: 'claim-2' });
    const previews = previewDocument([twoLoop, claim, log]);
    expect(previews['claim-1']!['near']!.message).toBe('"u" is not a coupling of the flow (couplings: g)');
    expect(previews['claim-1']!['value']!.message).toBe('Unknown symbol "delta" (character 15); a value may use numbers, constants (pi, e) and the parameters (n, eps)');
    expect(previews['claim-2']!['scaling']!.message).toBe('"tau" is not a rate of the flow (rates: t)');
    expect(previews['claim-2']!['observable']!.message).toBe('"chi" is not a rate of the flow (rates: t)');
    expect(previews['claim-2']!['start']!.tex).toBe('g = 0.3');
  });

  test('a bare value in a point field is the one coupling of the flow', () => {
    const claim = claimBlockNode({ kind: 'stability', near: { g: 0 } }, { stepId: 'claim-3' });
    (claim.content!.find((f) => f.attrs?.field === 'near')!).content = [{ type: 'text', text: '3*eps/(n+8)' }];
    const preview = previewDocument([twoLoop, claim])['claim-3']!['near']!;
    expect(preview.message).toBeNull();
    expect(preview.tex).toContain('g = ');
  });

  test('in an identity every symbol is a free variable; an integrand may use only its variable and the parameters', () => {
    const identity = claimBlockNode({ kind: 'identity', lhs: '(1+x)^2', rhs: '1 + 2*x + x^2' }, { stepId: 'claim-4', flow: 'none' });
    const integral = claimBlockNode({ kind: 'integral', integrand: 'x/(exp(y) - 1)', variable: 'x', from: 0, to: 'Infinity', value: 'pi^2/6' }, { stepId: 'claim-5', flow: 'none' });
    const previews = previewDocument([identity, integral]);
    expect(previews['claim-4']!['lhs']!.message).toBeNull();
    expect(previews['claim-4']!['lhs']!.tex!.replace(/\s/g, '')).toBe('{\\left(1+x\\right)}^{2}');
    expect(previews['claim-5']!['integrand']!.message).toBe('Unknown symbol "y" (character 8); the integrand may use the variable x and the parameters (none)');
    expect(previews['claim-5']!['to']!.tex).toBe('\\infty');
  });

  test('our own field syntaxes say how to write them', () => {
    expect(previewField({ syntax: 'point', text: '0.1, 0.2', couplings: ['g', 'u'] }).message).toBe('Write a value per coupling as "coupling = value", e.g. g = 0.1');
    expect(previewField({ syntax: 'convention', text: 'UV' }).message).toBe('Write "uv" or "ir" or "map", not "UV"');
    expect(previewField({ syntax: 'names', text: 'g, sin' }).message).toBe('"sin" is the name of a function and cannot name a coupling');
    expect(previewField({ syntax: 'integer', text: '2.5' }).message).toBe('"2.5" is not a whole number');
    expect(previewField({ syntax: 'settings', text: 'points 24' }).message).toBe('Write a setting as "name = number", not points 24');
  });

  test('an empty field has neither TeX nor a message (its hint shows instead)', () => {
    expect(previewField({ syntax: 'expression', text: '   ' })).toEqual({ tex: null, message: null });
  });
});

test('previews use the same field addresses as the problems the reader reports', () => {
  const broken = flowBlock('flow-3', 'g', 'ir', [['beta', 'g', '']]);
  const reading = readDocument([broken]);
  expect(reading.flows[0]!.problems.map((p) => p.field)).toEqual(['beta[0].value']);
  expect(Object.keys(previewDocument([broken], reading)['flow-3']!)).toEqual(['name', 'couplings', 'convention', 'beta[0].name', 'beta[0].value']);
});
