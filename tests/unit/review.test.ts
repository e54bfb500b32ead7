// Review's pure parts: how a step is hashed (the byte sequence, checked against coreutils'
// sha256sum), which flow block a step depends on, the excerpts lists and mail show, why a
// sign-off no longer matches, and the mail templates' plain text.
import { describe, expect, test } from 'vitest';
import { claimBlockNode, flowBlockNode, type DocNode } from '../../flow/document';
import { composeMail, claimsTurnedFailingMail, remarkMail } from '../../server/mailTemplates';
import { clearingReason } from '../../server/review/signOffs';
import { excerptOf, hashBlock, readSteps } from '../../server/review/steps';

const doc = (content: DocNode[]): DocNode => ({ type: 'doc', content });

describe('step hashes', () => {
  test('a step hash is SHA-256 of "marginalia-step-1\\n" and the block as JSON with sorted keys', () => {
    // Reference: printf 'marginalia-step-1\n{"attrs":{"stepId":"s1"},"content":[{"text":"x","type":"text"}],"type":"paragraph"}' | sha256sum
    const node: DocNode = { type: 'paragraph', content: [{ text: 'x', type: 'text' }], attrs: { stepId: 's1' } };
    expect(hashBlock(node)).toBe('14388eb3560a8e985b1c931f92e395e3df541000fd0839721443356acfcb2f31');
  });

  test('the same block with its attributes in another order has the same hash; a changed letter does not', () => {
    const a: DocNode = { type: 'claimBlock', attrs: { stepId: 's', kind: 'identity', flow: 'none' }, content: [{ type: 'text', text: 'x' }] };
    const b: DocNode = { attrs: { flow: 'none', kind: 'identity', stepId: 's' }, content: [{ text: 'x', type: 'text' }], type: 'claimBlock' };
    expect(hashBlock(a)).toBe(hashBlock(b));
    expect(hashBlock({ ...a, content: [{ type: 'text', text: 'y' }] })).not.toBe(hashBlock(a));
  });
});

describe('what a step depends on', () => {
  const flowA = { ...flowBlockNode({ couplings: ['g'], convention: 'ir', beta: { g: '-g^2' } }, { name: 'A' }), attrs: { stepId: 'flow-a' } };
  const flowB = { ...flowBlockNode({ couplings: ['u'], convention: 'ir', beta: { u: '-u' } }, { name: 'B' }), attrs: { stepId: 'flow-b' } };
  const bound = (stepId: string, flow: string | null) => claimBlockNode({ kind: 'fixed-point', id: stepId, near: { g: 0 } }, { stepId, flow });

  test('a claim depends on the flow block above it, or the one it names, or none', () => {
    const steps = readSteps(doc([flowA, bound('c-above', null), flowB, bound('c-named', 'flow-a'), bound('c-none', 'none')]));
    expect(steps.get('c-above')?.dependencyStepId).toBe('flow-a');
    expect(steps.get('c-named')?.dependencyStepId).toBe('flow-a');
    expect(steps.get('c-none')?.dependencyStepId).toBeNull();
    expect(steps.get('c-above')?.dependencyHash).toBe(hashBlock(flowA));
  });

  test('a plot bound to the flow above depends on it like a claim', () => {
    const plot: DocNode = { type: 'trajectoryPlot', attrs: { stepId: 'p', flow: null }, content: [{ type: 'plotField', attrs: { field: 'caption' }, content: [{ type: 'text', text: 'towards the fixed point' }] }] };
    const steps = readSteps(doc([flowA, flowB, plot]));
    expect(steps.get('p')?.dependencyStepId).toBe('flow-b');
    expect(steps.get('p')?.excerpt).toBe('Trajectory plot "towards the fixed point"');
  });

  test('a second block with a step id already used is not a step of its own', () => {
    const first = { type: 'paragraph', attrs: { stepId: 'same' }, content: [{ type: 'text', text: 'first' }] };
    const second = { type: 'paragraph', attrs: { stepId: 'same' }, content: [{ type: 'text', text: 'second' }] };
    const steps = readSteps(doc([first, second]));
    expect(steps.size).toBe(1);
    expect(steps.get('same')?.excerpt).toBe('first');
  });
});

describe('sign-offs that no longer match', () => {
  const step = { stepId: 's', position: 0, type: 'claimBlock', excerpt: '', contentHash: 'c1', dependencyStepId: 'f', dependencyHash: 'd1' };
  const row = { contentHash: 'c1', dependencyStepId: 'f', dependencyHash: 'd1' };
  test('each change is named in words', () => {
    expect(clearingReason(row, step)).toBeNull();
    expect(clearingReason(row, undefined)).toBe('the step was removed from the derivation');
    expect(clearingReason(row, { ...step, contentHash: 'c2' })).toBe('the step was edited after the sign-off');
    expect(clearingReason(row, { ...step, dependencyHash: 'd2' })).toBe('the flow block it depends on was edited after the sign-off');
    expect(clearingReason(row, { ...step, dependencyHash: null })).toBe('the flow block it depends on was removed');
    expect(clearingReason(row, { ...step, dependencyStepId: 'g' })).toBe('the step is now bound to another flow block');
    expect(clearingReason(row, { ...step, dependencyStepId: null, dependencyHash: null })).toBe('the step is no longer bound to a flow block');
  });
});

describe('excerpts', () => {
  test('math keeps its dollars; blocks are named by kind and name; long text is cut with an ellipsis', () => {
    const para: DocNode = { type: 'paragraph', content: [{ type: 'text', text: 'so ' }, { type: 'mathInline', content: [{ type: 'text', text: 'g^*' }] }, { type: 'text', text: ' is stable' }] };
    expect(excerptOf(para)).toBe('so $g^*$ is stable');
    expect(excerptOf(claimBlockNode({ kind: 'epsilon-coefficient', id: 'nu-eps2', quantity: '1/t', near: { g: 0 }, power: 2, value: 1 }))).toBe('Claim "nu-eps2" (epsilon coefficient)');
    expect(excerptOf({ type: 'paragraph', content: [{ type: 'text', text: 'a'.repeat(400) }] })).toHaveLength(160);
    expect(excerptOf({ type: 'paragraph' })).toBe('(an empty paragraph)');
  });
});

describe('mail', () => {
  test('every mail has a plain-text body with the link back and why it was sent', () => {
    const mail = composeMail({ subject: 'S', blocks: [{ paragraph: 'One.' }, { quote: 'two\nlines' }, { list: ['a', 'b'] }], link: { href: 'http://x/y', label: 'Open it' }, reason: 'Because.' });
    expect(mail.text).toBe('One.\n\n> two\n> lines\n\n- a\n- b\n\nOpen it:\nhttp://x/y\n\n--\nBecause.\n');
    expect(mail.html).toContain('<a href="http://x/y">Open it</a>');
  });

  test('text from users is escaped in the HTML part', () => {
    const mail = remarkMail({ writer: 'A', derivationTitle: 'T', groupName: 'G', stepExcerpt: 'x < y', body: '<script>', reply: false, onTheirStep: true, link: 'http://x' });
    expect(mail.subject).toBe('A left a remark on your step in "T"');
    expect(mail.html).toContain('&lt;script&gt;');
    expect(mail.html).not.toContain('<script>');
  });

  test('claims that turned are listed one a line, with whose edits', () => {
    const mail = claimsTurnedFailingMail({ derivationTitle: 'T', groupName: 'G', claims: [{ name: 'a', kind: 'identity', message: 'differs at x = 1' }, { name: 'b', kind: 'order', message: '' }], editors: ['P', 'Q'], link: 'http://x' });
    expect(mail.subject).toBe('2 claims that held now fail in "T"');
    expect(mail.text).toContain('- a (identity): fails — differs at x = 1\n- b (order): fails\n');
    expect(mail.text).toContain('after edits by P and Q');
  });
});
