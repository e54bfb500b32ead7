// Demo data for the checked-steps benchmark: steps added to a derivation until it holds 200 steps
// with 40 claims — prose with inline and display math, four flow blocks, claims of every kind bound
// to them (or to no flow), and two trajectory plots. The first flow block added (the O(n) flow at
// n = 0, parameters n and eps) is the one the benchmark types into; it has ten claims. Shared by
// the benchmark and its profiling tool: growing the demo derivation on a server, and the waits for
// the document shown and for every verdict.
import { randomUUID } from 'node:crypto';
import type { Page } from 'playwright-core';
import { yXmlFragmentToProsemirrorJSON } from 'y-prosemirror';
import { claimBlockNode, flowBlockNode, readDocument, type DocNode } from '../../flow/document';
import { plotBlockNode } from '../../editor/blocks/plotNodes';
import type { DemoSessions, StartedServer } from '../helpers';
import { appendBlocks } from '../integration/checksDocument';
import { connectClient } from '../integration/collabClients';

/** The browser window of the benchmark and its profiling tool. */
export const BENCH_VIEWPORT = { width: 1280, height: 900 };

export const TARGET_STEPS = 200;
export const TARGET_CLAIMS = 40;
/** The verdicts a checked claim block shows (`data-verdict`); the others mean not checked yet. */
export const FINAL_VERDICTS = ['holds', 'fails', 'inconclusive', 'invalid'];

export interface GrownDocument {
  blocks: DocNode[];
  /** The flow block the benchmark edits, and the claims bound to it. */
  editedFlow: string;
  dependentClaims: string[];
}

const paragraph = (text: string, math?: string): DocNode => ({
  type: 'paragraph',
  attrs: { stepId: randomUUID() },
  content: [{ type: 'text', text }, ...(math ? [{ type: 'mathInline', content: [{ type: 'text', text: math }] }, { type: 'text', text: '.' }] : [])],
});

const display = (tex: string): DocNode => ({ type: 'mathDisplay', attrs: { stepId: randomUUID() }, content: [{ type: 'text', text: tex }] });

// Formulas and claims of the trade (REFERENCES.md: the O(n) RG functions, Kleinert and
// Schulte-Frohlinde 2001; the cubic anisotropy, Aharony 1973; the handbook values).
const onFlow = {
  couplings: ['g'],
  parameters: { n: 0, eps: 0.1 },
  convention: 'uv' as const,
  beta: { g: '-eps*g + (n+8)/3*g^2 - (3*n+14)/3*g^3' },
  rates: { t: '2 - ((n+2)/3*g - 5*(n+2)/18*g^2)', chi: '2 - (n+2)/18*g^2' },
};

const onClaims = (): Record<string, unknown>[] => [
  { kind: 'fixed-point', near: { g: '3*eps/(n+8)' } },
  { kind: 'fixed-point', near: { g: '3*eps/(n+8)' }, value: { g: '3*eps/(n+8) + 9*(3*n+14)/(n+8)^3*eps^2' }, order: 2 },
  { kind: 'stability', near: { g: '3*eps/(n+8)' }, relevant: 0 },
  { kind: 'stability', near: { g: 0 }, relevant: 1 },
  { kind: 'epsilon-coefficient', quantity: '1/t', near: { g: '3*eps/(n+8)' }, power: 1, value: '(n+2)/(4*(n+8))' },
  { kind: 'epsilon-coefficient', quantity: '1/t', near: { g: '3*eps/(n+8)' }, power: 2, value: '(n+2)*(n^2+23*n+60)/(8*(n+8)^3)' },
  { kind: 'epsilon-coefficient', quantity: 'chi/t', near: { g: '3*eps/(n+8)' }, power: 1, value: '(n+2)/(2*(n+8))' },
  { kind: 'epsilon-coefficient', quantity: '2 - chi', near: { g: '3*eps/(n+8)' }, power: 2, value: '(n+2)/(2*(n+8)^2)' },
  { kind: 'log-exponent', scaling: 't', observable: 'chi', start: { g: 0.3 }, value: '(n+2)/(n+8)', power: 1 },
  { kind: 'log-exponent', scaling: 't', observable: 'chi', start: { g: 0.2 }, value: '(n+2)/(n+8)' },
];

const cubicFlow = {
  couplings: ['u', 'v'],
  parameters: { n: 2, eps: 0.1 },
  convention: 'uv' as const,
  beta: { u: '-eps*u + (n+8)/3*u^2 + 2*u*v', v: '-eps*v + 3*v^2 + 4*u*v' },
};
const cubicClaims = (): Record<string, unknown>[] => [
  { kind: 'fixed-point', near: { u: '3*eps/(n+8)', v: 0 }, value: { u: '3*eps/(n+8)', v: 0 } },
  { kind: 'fixed-point', near: { u: 'eps/n', v: '(n-4)*eps/(3*n)' }, value: { u: 'eps/n', v: '(n-4)*eps/(3*n)' } },
  { kind: 'fixed-point', near: { u: 0, v: 'eps/3' }, value: { u: 0, v: 'eps/3' } },
  { kind: 'stability', near: { u: '3*eps/(n+8)', v: 0 }, eigenvalues: ['-eps', 'eps*(n-4)/(n+8)'] },
  { kind: 'stability', near: { u: 0, v: 0 }, relevant: 2 },
];

const mapFlow = { couplings: ['g'], parameters: { eps: 0.2, A: 0.5 }, convention: 'map' as const, beta: { g: '2^eps*g - A*g^2' } };
const mapClaims = (): Record<string, unknown>[] => [
  { kind: 'fixed-point', near: { g: '(2^eps - 1)/A' }, value: { g: '(2^eps - 1)/A' } },
  { kind: 'stability', near: { g: '(2^eps - 1)/A' }, eigenvalues: ['2 - 2^eps'] },
];

const oneLoop = { couplings: ['g'], parameters: { n: 1, eps: 0.05 }, convention: 'uv' as const, beta: { g: '-eps*g + (n+8)/3*g^2' } };
const oneLoopClaims = (): Record<string, unknown>[] => [
  { kind: 'fixed-point', near: { g: '3*eps/(n+8)' }, value: { g: '3*eps/(n+8)' } },
  { kind: 'stability', near: { g: '3*eps/(n+8)' }, eigenvalues: ['-eps'] },
  { kind: 'epsilon-coefficient', quantity: 'g', near: { g: '3*eps/(n+8)' }, power: 1, value: '3/(n+8)' },
];

// Claims without a flow (handbook values: ln(1+x) and Gamma series, integrals from standard tables).
const plainClaims = (): Record<string, unknown>[] => [
  { kind: 'identity', lhs: '(1 + x)^2', rhs: '1 + 2*x + x^2' },
  { kind: 'identity', lhs: 'gamma(1 + x)', rhs: 'x * gamma(x)' },
  { kind: 'identity', lhs: 'sin(x)^2 + cos(x)^2', rhs: '1' },
  { kind: 'coefficient', of: 'log(1 + x)', variable: 'x', power: 3, value: '1/3' },
  { kind: 'coefficient', of: 'exp(x)', variable: 'x', power: 4, value: '1/24' },
  { kind: 'coefficient', of: '(1 + x)^(1/2)', variable: 'x', power: 2, value: '-1/8' },
  { kind: 'integral', integrand: 'x/(exp(x) - 1)', variable: 'x', from: 0, to: 'Infinity', value: 'pi^2/6' },
  { kind: 'integral', integrand: 'log(x)*log(1 - x)', variable: 'x', from: 0, to: 1, value: '2 - pi^2/6' },
  { kind: 'integral', integrand: 'exp(-x^2)', variable: 'x', from: '-Infinity', to: 'Infinity', value: 'sqrt(pi)' },
  { kind: 'order', lhs: 'log(1 + x)', rhs: 'x - x^2/2', variable: 'x', order: 3 },
  { kind: 'order', lhs: 'exp(x)', rhs: '1 + x + x^2/2', variable: 'x', order: 3 },
  { kind: 'order', lhs: 'sin(x)', rhs: 'x - x^3/6', variable: 'x', order: 5 },
  { kind: 'identity', lhs: 'cosh(x)^2 - sinh(x)^2', rhs: '1' },
  { kind: 'coefficient', of: '1/(1 - x)', variable: 'x', power: 5, value: '1' },
  { kind: 'identity', lhs: 'exp(log(x))', rhs: 'x', domain: { x: [0.1, 3] } },
  { kind: 'integral', integrand: '1/(1 + x^2)', variable: 'x', from: 0, to: 1, value: 'pi/4' },
  { kind: 'coefficient', of: 'atan(x)', variable: 'x', power: 3, value: '-1/3' },
  { kind: 'identity', lhs: '(x^3 - 1)/(x - 1)', rhs: 'x^2 + x + 1', domain: { x: [1.5, 3] } },
  { kind: 'order', lhs: 'sqrt(1 + x)', rhs: '1 + x/2', variable: 'x', order: 2 },
  { kind: 'integral', integrand: 'x^2', variable: 'x', from: 0, to: 3, value: 9 },
];

let claimCount = 0;
function claim(spec: Record<string, unknown>, flow: string | null): DocNode {
  claimCount++;
  return claimBlockNode({ id: `bench-claim-${claimCount}`, ...(spec as { kind: 'identity' }) }, { stepId: randomUUID(), flow });
}

const sentences = [
  ['The chain is a self-avoiding walk of T steps on the hypercubic lattice, whose size we write as ', 'R^2_T'],
  ['Near four dimensions the interaction flows to ', 'g^* = 3\\epsilon/(n+8)'],
  ['At the marginal dimension the flow is slow, ', 'g(l) \\sim 3/((n+8)\\,l)'],
  ['The susceptibility exponent follows from the rate of ', '\\chi'],
  ['Integrating the flow up to the scale where ', 't(l^*) = 1'],
  ['The correction to scaling is governed by ', '\\omega = \\epsilon + O(\\epsilon^2)'],
];

/** The blocks to append to a body that already holds `steps` steps and `claims` claims. */
export function growDocument(existing: { steps: number; claims: number }): GrownDocument {
  claimCount = existing.claims;
  const editedFlow = randomUUID();
  const flows: { id: string; node: DocNode; claims: DocNode[] }[] = [];
  const on = { id: editedFlow, node: flowBlockNode(onFlow, { stepId: editedFlow, name: 'O(n) at n = 0, two loops (bench)' }), claims: onClaims().map((c) => claim(c, editedFlow)) };
  flows.push(on);
  const cubicId = randomUUID();
  flows.push({ id: cubicId, node: flowBlockNode(cubicFlow, { stepId: cubicId, name: 'isotropic and cubic (bench)' }), claims: cubicClaims().map((c) => claim(c, cubicId)) });
  const mapId = randomUUID();
  flows.push({ id: mapId, node: flowBlockNode(mapFlow, { stepId: mapId, name: 'a discrete RG map (bench)' }), claims: mapClaims().map((c) => claim(c, mapId)) });
  const oneId = randomUUID();
  flows.push({ id: oneId, node: flowBlockNode(oneLoop, { stepId: oneId, name: 'one loop (bench)' }), claims: oneLoopClaims().map((c) => claim(c, oneId)) });
  const dependentClaims = on.claims.map((c) => String(c.attrs!.stepId));

  const wantedClaims = Math.max(0, TARGET_CLAIMS - existing.claims);
  const flowClaims = flows.flatMap((f) => f.claims).length;
  const plain = plainClaims()
    .slice(0, Math.max(0, wantedClaims - flowClaims))
    .map((c) => claim(c, 'none'));

  const blocks: DocNode[] = [];
  for (const flow of flows) {
    blocks.push(paragraph('The flow we use next: ', flow.id === editedFlow ? 'dg/dl = -\\beta(g)' : '\\beta_u, \\beta_v'));
    blocks.push(flow.node, ...flow.claims);
    if (flow.id === editedFlow) blocks.push(plotBlockNode({ stepId: randomUUID(), caption: 'The chain coupling flowing to its fixed point', starts: ['g = 0.001', 'g = 0.2'], settings: { view: 'time' } }));
    if (flow.id === cubicId) blocks.push(plotBlockNode({ stepId: randomUUID(), caption: 'Isotropic and cubic couplings', starts: ['u = 0.01, v = 0.005', 'u = 0.06, v = 0.04'] }));
  }
  for (const [i, c] of plain.entries()) {
    blocks.push(c);
    if (i % 4 === 3) blocks.push(display('\\int_0^\\infty \\frac{x\\,dx}{e^x - 1} = \\frac{\\pi^2}{6}'));
  }
  let k = 0;
  while (existing.steps + blocks.length < TARGET_STEPS) {
    const [text, math] = sentences[k % sentences.length]!;
    blocks.push(k % 7 === 6 ? display('\\langle R^2_T \\rangle \\sim D\\,T\\,(\\ln T)^{1/4}') : paragraph(`${k + 1}. ${text}`, math));
    k++;
  }
  return { blocks, editedFlow, dependentClaims };
}

/**
 * Waits until every step is in the editor and the editor is on screen (not hidden while the text
 * loads); returns when that was on the page's clock (performance.now()): the end of the first frame
 * drawn with it, read by a task queued from that frame's animation callback, which runs once the
 * frame's style, layout and paint are done. Not when the test runner heard of it (a round trip later).
 */
export async function waitForDocumentShown(page: Page): Promise<number> {
  const shownAt = await page.waitForFunction(
    (steps) => {
      const w = window as unknown as { __shownAt?: number; __shownSeen?: boolean };
      if (w.__shownAt !== undefined) return w.__shownAt;
      const text = document.querySelector<HTMLElement>('.derivation-text');
      if (!w.__shownSeen && text !== null && text.checkVisibility() && text.childElementCount >= steps) {
        w.__shownSeen = true;
        setTimeout(() => (w.__shownAt = performance.now()), 0);
      }
      return false;
    },
    TARGET_STEPS,
    { timeout: 60_000, polling: 'raf' },
  );
  return (await shownAt.jsonValue()) as number;
}

/**
 * Waits until every claim block in the editor shows a verdict; returns when that was, on the page's
 * clock: the start of the first frame after the last verdict was written. Watched from the page's
 * own changes (a MutationObserver on the verdict attribute, and a slow check for blocks that arrive
 * with one), not by a check on every frame: the wait's own work would otherwise run inside the very
 * frames whose length is measured while the first checks run, and keep a frame drawn every 16 ms.
 */
export async function waitForEveryVerdict(page: Page): Promise<number> {
  // A string, not a function: the test runner's compiler would name the inner functions with a
  // helper the page does not have.
  return (await page.evaluate(`new Promise((resolve, reject) => {
    const final = ${JSON.stringify(FINAL_VERDICTS)};
    const blocks = document.getElementsByClassName('claim-block');
    let finished = false;
    const check = () => {
      if (finished) return;
      let shown = 0;
      for (const block of blocks) {
        if (!block.closest('.derivation-text')) continue;
        if (!final.includes(block.dataset.verdict ?? '')) return;
        shown++;
      }
      if (shown < ${TARGET_CLAIMS}) return;
      finished = true;
      observer.disconnect();
      clearInterval(slow);
      clearTimeout(limit);
      requestAnimationFrame(() => resolve(performance.now()));
    };
    const observer = new MutationObserver(check);
    observer.observe(document.body, { subtree: true, attributes: true, attributeFilter: ['data-verdict'] });
    const slow = setInterval(check, 250);
    const limit = setTimeout(() => {
      observer.disconnect();
      clearInterval(slow);
      reject(new Error('not every claim showed a verdict within 120 s'));
    }, 120000);
    check();
  })`)) as number;
}

/** Grows the demo derivation's working copy to the benchmark's size; returns the edited flow and its claims. */
export async function growDemoDerivation(server: StartedServer, demo: DemoSessions): Promise<{ editedFlow: string; dependentClaims: string[] }> {
  const client = connectClient(server.url, demo.derivationId, { cookie: demo.cookies.author });
  await client.synced();
  const body = yXmlFragmentToProsemirrorJSON(client.doc.getXmlFragment('body')) as DocNode;
  const steps = body.content?.length ?? 0;
  const claims = readDocument(body).claims.length;
  const grown = growDocument({ steps, claims });
  appendBlocks(client.doc, grown.blocks);
  // Wait until the server has stored the edit and checked it in the background, so its thread
  // does not share the cores with the browser's first measurements.
  const deadline = Date.now() + 120_000;
  for (;;) {
    const answer = await demo.as.author.get<{ pending: boolean; claims: unknown[] }>(`/api/derivations/${demo.derivationId}/checks`);
    if (!answer.body.pending && answer.body.claims.length >= TARGET_CLAIMS) break;
    if (Date.now() > deadline) throw new Error('the server did not check the grown derivation within two minutes');
    await new Promise((resolve) => setTimeout(resolve, 250));
  }
  client.destroy();
  const check = readDocument(yXmlFragmentToProsemirrorJSON(client.doc.getXmlFragment('body')) as DocNode);
  console.log(`Derivation grown from ${steps} steps (${claims} claims) to ${steps + grown.blocks.length} steps (${check.claims.length} claims).`);
  return grown;
}
