/**
 * Solver benchmark (`npm run bench`): median milliseconds per claim kind on a fixed set of
 * claims, through the public runner, after a warm-up; then the log-exponent extraction against
 * the same extraction written with SciPy's solve_ivp (tests/bench/logexp_scipy.py), run in the
 * same session: time ratio and difference of the results. Reports only; asserts nothing.
 */
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { checkClaims } from '../../flow/runner';
import type { ClaimFile, ClaimResult, FlowSpec } from '../../flow/types';

const WARM_UP = 10;
const RUNS = 31;

// Two-loop O(n) functions (Kleinert and Schulte-Frohlinde 2001, via REFERENCES.md).
const onFlow = (n: number, eps: number): FlowSpec => ({
  couplings: ['g'],
  parameters: { n, eps },
  convention: 'uv',
  beta: { g: '-eps*g + (n+8)/3*g^2 - (3*n+14)/3*g^3' },
  rates: { t: '2 - ((n+2)/3*g - 5*(n+2)/18*g^2)', chi: '2 - (n+2)/18*g^2', xi: '1' },
});

const mainFile: ClaimFile = {
  flow: onFlow(1, 0.1),
  claims: [
    { id: 'identity', kind: 'identity', lhs: '-eps*g + (n+8)/3*g^2', rhs: 'g*((n+8)/3*g - eps)' },
    { id: 'order', kind: 'order', lhs: 'log(1 + x)', rhs: 'x - x^2/2', variable: 'x', order: 3 },
    { id: 'coefficient', kind: 'coefficient', of: '-eps*g + (n+8)/3*g^2', variable: 'g', power: 2, value: '(n+8)/3' },
    { id: 'integral', kind: 'integral', integrand: 'x/(exp(x) - 1)', variable: 'x', from: 0, to: 'Infinity', value: 'pi^2/6' },
    { id: 'fixed-point', kind: 'fixed-point', near: { g: '3*eps/(n+8)' }, value: { g: '3*eps/(n+8) + 9*(3*n+14)/(n+8)^3*eps^2' }, order: 2 },
    { id: 'stability', kind: 'stability', near: { g: 0 }, eigenvalues: ['eps'], relevant: 1 },
    { id: 'epsilon-coefficient', kind: 'epsilon-coefficient', quantity: '1/t', near: { g: '3*eps/(n+8)' }, power: 2, value: '(n+2)*(n^2+23*n+60)/(8*(n+8)^3)' },
    { id: 'log-exponent (chi)', kind: 'log-exponent', scaling: 't', observable: 'chi', start: { g: 0.3 }, value: '(n+2)/(n+8)', power: 1 },
    { id: 'log-exponent (xi)', kind: 'log-exponent', scaling: 't', observable: 'xi', start: { g: 0.3 }, value: '(n+2)/(2*(n+8))' },
    { id: 'log-exponent (specific heat)', kind: 'log-exponent', scaling: 't', observable: { integral: { t: 2 } }, start: { g: 0.3 }, value: '(4-n)/(n+8)' },
  ],
};

const stiffFile: ClaimFile = {
  flow: {
    couplings: ['g', 'w'],
    parameters: { n: 1 },
    convention: 'ir',
    beta: { g: '-(n+8)/3*g^2 + (3*n+14)/3*g^3 + g*w', w: '-50*w + g^2' },
    rates: { t: '2 - ((n+2)/3*g - 5*(n+2)/18*g^2)', chi: '2 - (n+2)/18*g^2 + w' },
  },
  claims: [{ id: 'log-exponent (stiff)', kind: 'log-exponent', scaling: 't', observable: 'chi', start: { g: 0.3, w: 0.5 }, value: '1/3' }],
};

const mapFile: ClaimFile = {
  flow: { couplings: ['g'], parameters: {}, convention: 'map', beta: { g: 'g/(1 + g)' }, rates: { t: '2 - g', chi: '2' } },
  claims: [{ id: 'log-exponent (map)', kind: 'log-exponent', scaling: 't', observable: 'chi', start: { g: 0.5 }, value: 1 }],
};

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)]!;
}

/** Median of the runner's own per-claim milliseconds, after a warm-up. */
function time(file: ClaimFile, id: string): { ms: number; result: ClaimResult } {
  let result: ClaimResult | undefined;
  for (let i = 0; i < WARM_UP; i++) checkClaims(file, { only: [id] });
  const ms: number[] = [];
  for (let i = 0; i < RUNS; i++) {
    result = checkClaims(file, { only: [id] }).claims[0]!;
    ms.push(result.ms);
  }
  return { ms: median(ms), result: result! };
}

function pad(text: string, width: number): string {
  return text.length >= width ? text : text + ' '.repeat(width - text.length);
}

function perKind(): void {
  console.log(`Median ms per claim (${RUNS} runs after ${WARM_UP} warm-up runs, through checkClaims):`);
  for (const file of [mainFile, stiffFile, mapFile]) {
    for (const claim of file.claims as { id: string; kind: string }[]) {
      const { ms, result } = time(file, claim.id);
      console.log(`  ${pad(claim.id, 30)} ${pad(ms.toFixed(3), 8)} ms  ${result.status}`);
    }
  }
}

interface ScipyLine {
  observable: 'chi' | 'heat';
  n: number;
  p: number;
  uncertainty: number;
  exact: number;
  ms: number;
}

/** One SciPy extraction for a case, timed inside Python (imports and start-up excluded). */
function scipy(script: string, observable: 'chi' | 'heat', n: number): ScipyLine | string {
  const python = spawnSync('/usr/bin/python3', [script, '9', `${observable}:${n}`], { encoding: 'utf8' });
  if (python.status !== 0) return python.stderr.trim().split('\n').pop() ?? 'python3 failed';
  return JSON.parse(python.stdout.trim()) as ScipyLine;
}

function scipyComparison(): void {
  const script = fileURLToPath(new URL('./logexp_scipy.py', import.meta.url));
  console.log('\nLog-exponent extraction, ours against SciPy solve_ivp (DOP853) doing the same steps,');
  console.log('each case timed back to back (median of several runs each):');
  console.log('  case              ours ms   SciPy ms   ratio   ours - exact   SciPy - exact   ours - SciPy');
  const ratios: number[] = [];
  for (const observable of ['chi', 'heat'] as const) {
    for (let n = 0; n <= 4; n++) {
      const line = scipy(script, observable, n);
      if (typeof line === 'string') {
        console.log(`\nSciPy comparison skipped: ${line}\n(apt-get install -y python3-scipy)`);
        return;
      }
      const value = observable === 'chi' ? '(n+2)/(n+8)' : '(4-n)/(n+8)';
      const claimed = observable === 'chi' ? 'chi' : { integral: { t: 2 } };
      const file: ClaimFile = { flow: onFlow(n, 0), claims: [{ id: 'c', kind: 'log-exponent', scaling: 't', observable: claimed, start: { g: 0.3 }, value }] };
      const { ms, result } = time(file, 'c');
      const ours = result.measured as number;
      const ratio = line.ms / ms;
      ratios.push(ratio);
      const e = (v: number) => pad(v.toExponential(1), 13);
      console.log(
        `  ${pad(`${observable} n=${n}`, 16)}  ${pad(ms.toFixed(3), 8)}  ${pad(line.ms.toFixed(2), 9)}  ${pad(ratio.toFixed(1), 6)}  ${e(ours - line.exact)}  ${e(line.p - line.exact)}   ${(ours - line.p).toExponential(1)}`,
      );
    }
  }
  console.log(`  median time ratio SciPy / ours: ${median(ratios).toFixed(1)} (goal: at least 10)`);
}

perKind();
scipyComparison();
