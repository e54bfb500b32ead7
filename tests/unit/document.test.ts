// The conversion between the whiteboard's blocks and the solver's claim file, both ways.
// The example claim files hold published values (REFERENCES.md: the O(n) two-loop functions and
// exponents from Kleinert and Schulte-Frohlinde and Wilson; the log corrections from Wegner and
// Riedel; the cubic fixed points from Aharony), so a document that round-trips them must check
// exactly as they do.
import { readFileSync } from 'node:fs';
import { describe, expect, test } from 'vitest';
import {
  claimBlockNode,
  claimFileToBlocks,
  CLAIM_BLOCK,
  exportClaimFile,
  fieldValue,
  flowBlockNode,
  FLOW_BLOCK,
  problemResult,
  readDocument,
  rowNode,
  splitTopLevel,
  type DocNode,
} from '@/flow/document';
import { checkClaims, type ClaimFile } from '@/flow';

const example = (name: string): ClaimFile => JSON.parse(readFileSync(new URL(`../../flow/examples/${name}.json`, import.meta.url), 'utf8')) as ClaimFile;

let counter = 0;
const nextStepId = () => `step-${String(++counter).padStart(4, '0')}-0000-0000`;

function doc(...blocks: DocNode[]): DocNode {
  return { type: 'doc', content: blocks };
}

function paragraph(text: string): DocNode {
  return { type: 'paragraph', attrs: { stepId: nextStepId() }, content: [{ type: 'text', text }] };
}

function field(key: string, text: string): DocNode {
  return text === '' ? { type: 'blockField', attrs: { field: key } } : { type: 'blockField', attrs: { field: key }, content: [{ type: 'text', text }] };
}

/** A flow block written field by field, the way the editor stores one. */
function handWrittenFlow(stepId: string, rows: { couplings: string; convention: string; parameters?: [string, string][]; beta?: [string, string][]; rates?: [string, string][] }): DocNode {
  return {
    type: FLOW_BLOCK,
    attrs: { stepId },
    content: [
      field('name', ''),
      field('couplings', rows.couplings),
      field('convention', rows.convention),
      ...(rows.parameters ?? []).map(([n, v]) => rowNode('parameter', n, v)),
      ...(rows.beta ?? []).map(([n, v]) => rowNode('beta', n, v)),
      ...(rows.rates ?? []).map(([n, v]) => rowNode('rate', n, v)),
    ],
  };
}

function handWrittenClaim(stepId: string, kind: string, fields: Record<string, string>, flow: string | null = null): DocNode {
  return { type: CLAIM_BLOCK, attrs: { stepId, kind, flow }, content: Object.entries(fields).map(([k, v]) => field(k, v)) };
}

/** Numbers written as strings ("0") read back as numbers: the same value for the solver. */
function normalised(file: ClaimFile): unknown {
  return JSON.parse(JSON.stringify(file), (_key, value: unknown) => (typeof value === 'string' && /^[-+]?\d+(\.\d+)?$/.test(value) ? Number(value) : value));
}

describe('a claim file imported as blocks reads back as the same claim file', () => {
  for (const name of ['on-model', 'log-corrections', 'cubic-anisotropy', 'discrete-map']) {
    test(`flow/examples/${name}.json`, () => {
      const file = example(name);
      const imported = claimFileToBlocks(file, { stepId: nextStepId });
      if (!imported.ok) throw new Error(JSON.stringify(imported.errors));
      expect(imported.flow).toBe(true);
      expect(imported.claimCount).toBe(file.claims.length);
      const reading = readDocument(doc(paragraph('Some prose first.'), ...imported.blocks));
      expect(reading.claims.every((c) => c.problems.length === 0)).toBe(true);
      expect(reading.groups).toHaveLength(1);
      const exported = exportClaimFile(reading, reading.groups[0]!.key)!;
      expect(normalised(exported)).toEqual(normalised(file));
    });
  }

  test('the O(n) example checks the same from the blocks as from the file: all 12 claims hold', () => {
    // Published values: REFERENCES.md, O(n) two-loop functions and epsilon expansion (Kleinert and
    // Schulte-Frohlinde 2001; Wilson 1972), from memory.
    const file = example('on-model');
    const imported = claimFileToBlocks(file, { stepId: nextStepId });
    if (!imported.ok) throw new Error('import refused');
    const group = readDocument(doc(...imported.blocks)).groups[0]!;
    const fromBlocks = checkClaims(group.file);
    const fromFile = checkClaims(file);
    expect(fromBlocks.claims.map((c) => [c.id, c.status])).toEqual(fromFile.claims.map((c) => [c.id, c.status]));
    expect(fromBlocks.summary.holds).toBe(12);
  }, 60_000);
});

describe('reading blocks written in the editor', () => {
  const flowId = 'flow-aaaa-0001';
  const twoLoop = handWrittenFlow(flowId, {
    couplings: 'g',
    convention: 'uv',
    parameters: [
      ['n', '0'],
      ['eps', '0.1'],
    ],
    beta: [['g', '-eps*g + (n+8)/3*g^2 - (3*n+14)/3*g^3']],
    rates: [['t', '2 - ((n+2)/3*g - 5*(n+2)/18*g^2)']],
  });

  test('a flow block becomes the solver flow with numbers as numbers and expressions as text', () => {
    const reading = readDocument(doc(twoLoop));
    expect(reading.flows[0]!.problems).toEqual([]);
    expect(reading.flows[0]!.spec).toEqual({
      couplings: ['g'],
      parameters: { n: 0, eps: 0.1 },
      convention: 'uv',
      beta: { g: '-eps*g + (n+8)/3*g^2 - (3*n+14)/3*g^3' },
      rates: { t: '2 - ((n+2)/3*g - 5*(n+2)/18*g^2)' },
    });
  });

  test('a claim binds to the nearest flow block above it, and to no flow above every flow block', () => {
    const secondFlow = handWrittenFlow('flow-bbbb-0002', { couplings: 'u', convention: 'ir', beta: [['u', '-u^2']] });
    const reading = readDocument(
      doc(
        handWrittenClaim('claim-0', 'identity', { name: 'square', lhs: '(1+x)^2', rhs: '1 + 2*x + x^2' }),
        twoLoop,
        paragraph('The fixed point:'),
        handWrittenClaim('claim-1', 'fixed-point', { name: 'wf', near: 'g = 3*eps/(n+8)' }),
        secondFlow,
        handWrittenClaim('claim-2', 'fixed-point', { name: 'zero', near: 'u = 0' }),
        handWrittenClaim('claim-3', 'stability', { name: 'wf-again', near: '3*eps/(n+8)' }, flowId),
        handWrittenClaim('claim-4', 'identity', { name: 'free', lhs: 'n', rhs: 'n' }, 'none'),
      ),
    );
    expect(reading.claims.map((c) => [c.id, c.flowStepId])).toEqual([
      ['square', null],
      ['wf', flowId],
      ['zero', 'flow-bbbb-0002'],
      ['wf-again', flowId],
      ['free', null],
    ]);
    expect(reading.groups.map((g) => [g.key, g.claimStepIds])).toEqual([
      ['none', ['claim-0', 'claim-4']],
      [flowId, ['claim-1', 'claim-3']],
      ['flow-bbbb-0002', ['claim-2']],
    ]);
    // A bare value in a point field means the one coupling of the bound flow.
    expect(reading.claims[3]!.claim).toMatchObject({ near: { g: '3*eps/(n+8)' } });
  });

  test('a claim without a name gets an id from its step', () => {
    const reading = readDocument(doc(handWrittenClaim('0f1e2d3c-aaaa-bbbb', 'identity', { lhs: 'x', rhs: 'x' })));
    expect(reading.claims[0]!.id).toBe('step-0f1e2d3c');
  });

  test('a claim turns from fails to holds when its flow is corrected', () => {
    // Fixed point of the two-loop flow at n = 0 (REFERENCES.md: g* = 3 eps/(n+8) + 9(3n+14)/(n+8)^3 eps^2).
    const claim = handWrittenClaim('claim-wf', 'fixed-point', { name: 'wf', near: 'g = 3*eps/(n+8)', value: 'g = 3*eps/(n+8) + 9*(3*n+14)/(n+8)^3*eps^2', order: '2' });
    const wrongSign = handWrittenFlow(flowId, { couplings: 'g', convention: 'uv', parameters: [['n', '0'], ['eps', '0.1']], beta: [['g', '-eps*g + (n+8)/3*g^2 + (3*n+14)/3*g^3']] });
    const before = checkClaims(readDocument(doc(wrongSign, claim)).groups[0]!.file);
    const after = checkClaims(readDocument(doc(twoLoop, claim)).groups[0]!.file);
    expect(before.claims[0]!.status).toBe('fails');
    expect(after.claims[0]!.status).toBe('holds');
  }, 30_000);
});

describe('what is wrong in a block is said at its field, and the claim is not sent to the solver', () => {
  test('a flow block without a convention, with a beta function for an unknown coupling and a coupling without one', () => {
    const flow = handWrittenFlow('flow-1', { couplings: 'g, u', convention: '', beta: [['w', '-w^2']] });
    const reading = readDocument(doc(flow, handWrittenClaim('c1', 'fixed-point', { near: 'g = 0, u = 0' })));
    const problems = reading.flows[0]!.problems.map((p) => [p.field, p.message]);
    expect(problems).toEqual([
      ['convention', expect.stringContaining('missing')],
      ['beta[0].name', expect.stringContaining('w is not one of the couplings (g, u)')],
      ['couplings', expect.stringContaining('the coupling g has no beta function')],
      ['couplings', expect.stringContaining('the coupling u has no beta function')],
    ]);
    expect(reading.flows[0]!.spec).toBeNull();
    const claim = reading.claims[0]!;
    expect(claim.claim).toBeNull();
    expect(claim.problems[0]).toMatchObject({ field: 'flow', message: expect.stringContaining('flow 1') });
    expect(reading.groups).toEqual([]);
    const result = problemResult(claim);
    expect(result.status).toBe('invalid');
    expect(result.message).toContain('has a problem');
  });

  test('bad field syntax, missing required fields, a flow kind with no flow, a repeated name', () => {
    const reading = readDocument(
      doc(
        handWrittenClaim('c1', 'stability', { name: 'a', near: 'g = 0' }),
        handWrittenClaim('c2', 'coefficient', { name: 'b', of: 'exp(x)', variable: 'x', power: 'two', value: '1/2' }),
        handWrittenClaim('c3', 'integral', { name: 'b', integrand: 'x', variable: 'x', from: '0', to: '1', value: '1/2' }),
        handWrittenClaim('c4', 'identity', { name: 'c', lhs: 'x', domain: 'x between 0 and 1' }),
        handWrittenClaim('c5', 'no-such-kind', {}),
      ),
    );
    const byName = (stepId: string) => reading.claims.find((c) => c.stepId === stepId)!.problems.map((p) => [p.field, p.message]);
    expect(byName('c1')).toEqual([['flow', expect.stringContaining('needs a flow block')]]);
    expect(byName('c2')).toEqual([['power', 'Power: "two" is not a whole number']]);
    expect(byName('c3')).toEqual([['name', expect.stringContaining('already has the name "b"')]]);
    expect(byName('c4')).toEqual([
      ['rhs', expect.stringContaining('Right side: missing (required)')],
      ['domain', expect.stringContaining('write an interval as "x in [a, b]"')],
    ]);
    expect(byName('c5')).toEqual([['kind', expect.stringContaining('is not a claim kind')]]);
    expect(reading.groups).toEqual([]);
  });

  test('two copies of one field (a concurrent insert) are pointed out; an empty copy is ignored', () => {
    const flow = handWrittenFlow('f', { couplings: 'g', convention: 'ir', beta: [['g', '-g^2']] });
    flow.content!.push(field('couplings', ''));
    expect(readDocument(doc(flow)).flows[0]!.problems).toEqual([]);
    flow.content!.push(field('couplings', 'h'));
    expect(readDocument(doc(flow)).flows[0]!.problems).toEqual([{ stepId: 'f', field: 'couplings', message: expect.stringContaining('appears twice') }]);
  });
});

describe('importing a claim file', () => {
  test('a misspelt field is refused, naming it, and nothing is to be inserted', () => {
    const file = example('on-model');
    const bad = { ...file, claims: [...file.claims, { id: 'x', kind: 'identity', lhs: '1', rhs: '1', tolerence: 1e-6 }] };
    const imported = claimFileToBlocks(bad);
    expect(imported).toEqual({ ok: false, errors: [{ field: 'claims[12].tolerence', message: 'claims[12].tolerence: unknown field' }] });
  });

  test('a file that is not a claim file says so', () => {
    expect(claimFileToBlocks([1, 2])).toMatchObject({ ok: false, errors: [{ field: '(file)' }] });
    expect(claimFileToBlocks({ flow: { couplings: ['g'], convention: 'uv', beta: { g: 'g', h: 'h' } }, claims: [] })).toEqual({
      ok: false,
      errors: [{ field: 'flow.beta.h', message: 'flow.beta.h: h is not one of the couplings' }],
    });
  });

  test('a file without a flow gives claim blocks that stand alone', () => {
    const imported = claimFileToBlocks({ claims: [{ id: 'bose', kind: 'integral', integrand: 'x/(exp(x) - 1)', variable: 'x', from: 0, to: 'Infinity', value: 'pi^2/6' }] });
    if (!imported.ok) throw new Error('refused');
    expect(imported.flow).toBe(false);
    expect(imported.blocks.map((b) => [b.type, b.attrs?.flow])).toEqual([[CLAIM_BLOCK, 'none']]);
  });
});

describe('field syntax', () => {
  test('lists split at top-level commas only', () => {
    expect(splitTopLevel('atan2(a, b), c; [1, 2]')).toEqual(['atan2(a, b)', 'c', '[1, 2]']);
  });

  test('points, eigenvalues, intervals, settings and observables read and write back', () => {
    expect(fieldValue('point', 'u = 3*eps/(n+8), v = 0')).toEqual({ u: '3*eps/(n+8)', v: 0 });
    expect(fieldValue('eigenvalues', 'eps, complex(0.5, -2*eps)')).toEqual(['eps', { re: 0.5, im: '-2*eps' }]);
    expect(fieldValue('domain', 'x in [0, 1], y = [-1, pi]')).toEqual({ x: [0, 1], y: [-1, 'pi'] });
    expect(fieldValue('settings', 'points = 24, starts = 20')).toEqual({ points: 24, starts: 20 });
    expect(fieldValue('observable', 'integral(t = 2)')).toEqual({ integral: { t: 2 } });
    expect(fieldValue('observable', 'chi')).toBe('chi');
    expect(() => fieldValue('point', 'g = 0, g = 1')).toThrow('g is given twice');
    const block = claimBlockNode({ kind: 'stability', id: 's', near: { u: 0, v: 'eps/3' }, eigenvalues: [{ re: 1, im: 2 }, '-eps'] });
    const texts = Object.fromEntries(block.content!.map((f) => [f.attrs!.field, f.content?.[0]?.text ?? '']));
    expect(texts).toMatchObject({ name: 's', near: 'u = 0, v = eps/3', eigenvalues: 'complex(1, 2), -eps' });
    const flow = flowBlockNode({ couplings: ['u', 'v'], convention: 'uv', parameters: { n: 2 }, beta: { u: 'u', v: 'v' } });
    expect(flow.content!.filter((c) => c.type === 'blockRow').map((r) => r.attrs!.row)).toEqual(['parameter', 'beta', 'beta']);
  });
});
