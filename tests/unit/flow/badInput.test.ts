import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { checkClaimFile, checkClaims, checkClaimsAsync } from '../../../flow/runner';
import { CLAIM_KINDS, type FlowSpec } from '../../../flow/types';
import { one, onFlow, run } from './helpers';

describe('bad input gets a clear message and changes nothing else', () => {
  it('an unknown symbol in beta makes the flow claims invalid, naming the symbol and where symbols come from; other claims still run', () => {
    const flow: FlowSpec = { ...onFlow(1, 0.1), beta: { g: '-eps*g + lam*g^2' } };
    const report = run(flow, [
      { id: 'fp', kind: 'fixed-point', near: { g: 0.03 } },
      { id: 'id', kind: 'identity', lhs: 'n + 1', rhs: '2' },
    ]);
    expect(report.claims[0]!.status).toBe('invalid');
    expect(report.claims[0]!.message).toContain('unknown symbol "lam"');
    expect(report.claims[0]!.message).toContain('flow.beta.g');
    expect(report.claims[0]!.message).toContain('parameters (n, eps)');
    expect(report.claims[1]!.status).toBe('holds');
  });

  it('a malformed rate makes only the claims that use it invalid', () => {
    const flow: FlowSpec = { ...onFlow(1, 0.1), rates: { t: '2 - (n+2)/3*g', chi: '2 - (n+2)/18*g^^2' } };
    const near = { g: '3*eps/(n+8)' };
    const report = run(flow, [
      { id: 'fp', kind: 'fixed-point', near },
      { id: 'nu', kind: 'epsilon-coefficient', quantity: '1/t', near, power: 1, value: '(n+2)/(4*(n+8))' },
      { id: 'eta', kind: 'epsilon-coefficient', quantity: '2 - chi', near, power: 2, value: 0 },
    ]);
    expect(report.claims.map((c) => c.status)).toEqual(['holds', 'holds', 'invalid']);
    expect(report.claims[2]!.message).toContain('flow.rates.chi');
  });

  it('a high-order coefficient of a function whose derivatives grow quickly still ends within the time bound', () => {
    const result = one(undefined, { kind: 'coefficient', of: 'exp(sin(x))*tan(x)', variable: 'x', power: 24, value: 0 }, { timeLimitMs: 300 });
    expect(['holds', 'fails', 'inconclusive']).toContain(result.status);
    expect(result.ms).toBeLessThan(2000);
  });

  it('a syntax error in a claim names the field, the text and the position', () => {
    const result = one(undefined, { kind: 'identity', lhs: '(x + 1', rhs: 'x' });
    expect(result.status).toBe('invalid');
    expect(result.message).toMatch(/claims\[0\]\.lhs: cannot read "\(x \+ 1": .* at character \d+/);
  });

  it('a claim without a field it needs says which', () => {
    expect(one(onFlow(1, 0.1), { kind: 'epsilon-coefficient', quantity: 't', power: 2, value: 0 }).message).toBe('claims[0].near: missing (required)');
    expect(one(onFlow(1, 0.1), { kind: 'stability', near: { g: 0 } }).message).toContain('give the claimed eigenvalues');
    expect(one(onFlow(1, 0.1), { kind: 'fixed-point', near: { h: 0 } }).message).toContain('claims[0].near.h: "h" is not a coupling');
    expect(one(onFlow(1, 0.1), { kind: 'fixed-point', near: {} }).message).toContain('claims[0].near.g: missing');
    expect(one(onFlow(1, 0.1), { kind: 'epsilon-coefficient', quantity: 't', near: { g: 0 }, power: 1, value: 0, parameter: 'd' }).message).toContain('"d" is not a parameter');
  });

  it('a quantity may use rate names, but an unknown name is refused with the rates listed', () => {
    const result = one(onFlow(1, 0.1), { kind: 'epsilon-coefficient', quantity: '1/nu', near: { g: '3*eps/(n+8)' }, power: 1, value: 0 });
    expect(result.status).toBe('invalid');
    expect(result.message).toContain('rate names (t, chi)');
  });

  it('an unknown solver setting is refused with the known ones listed', () => {
    const result = one(undefined, { kind: 'integral', integrand: 'x', variable: 'x', from: 0, to: 1, value: 0.5, settings: { intervals: 3 } });
    expect(result.status).toBe('invalid');
    expect(result.message).toContain('claims[0].settings.intervals: unknown setting; settings of a integral claim: absoluteTolerance, relativeTolerance, maxIntervals');
  });

  it('a flow written in the wrong convention is flagged beside every flow verdict', () => {
    // mu dg/dmu entries declared as dg/dl: at eps = 0 the coupling would grow in the infrared
    const wrong = one({ ...onFlow(1, 0.1), convention: 'ir' }, { kind: 'fixed-point', near: { g: '3*eps/(n+8)' } });
    const flag = wrong.sanity.find((f) => f.check === 'marginal-sign')!;
    expect(flag.ok).toBe(false);
    expect(flag.message).toContain('set the convention to "uv"');
    const right = one(onFlow(1, 0.1), { kind: 'fixed-point', near: { g: '3*eps/(n+8)' } });
    expect(right.sanity.find((f) => f.check === 'marginal-sign')!.ok).toBe(true);
  });

  it('the file shape errors name the field and produce no report', () => {
    const result = checkClaimFile({ flow: { couplings: ['g'], convention: 'down', beta: { g: 'g' } }, claims: [] });
    expect(result.ok).toBe(false);
    if (!result.ok) expect(result.errors[0]!.field).toBe('flow.convention');
  });

  it('the claims of a file are not changed by checking them', () => {
    const claims = [{ id: 'a', kind: 'identity', lhs: 'x', rhs: 'x' }];
    const file = { flow: onFlow(1, 0.1), claims };
    const before = JSON.stringify(file);
    checkClaimFile(file);
    expect(JSON.stringify(file)).toBe(before);
  });
});

describe('time bound and cancellation', () => {
  const slow = { id: 'slow', kind: 'integral', integrand: 'sin(1/x)/x', variable: 'x', from: 0, to: 1, value: 0, settings: { maxIntervals: 10_000_000, absoluteTolerance: 1e-300, relativeTolerance: 1e-300 } };

  it('a claim that would run long stops at the time bound as inconclusive, and the next claim still runs', () => {
    const report = run(undefined, [slow, { id: 'quick', kind: 'identity', lhs: '1', rhs: '1' }], { timeLimitMs: 50 });
    expect(report.claims[0]!.status).toBe('inconclusive');
    expect(report.claims[0]!.message).toContain('time bound of 50 ms');
    expect(report.claims[1]!.status).toBe('holds');
  });

  it('a cancel request stops the running check and leaves the rest unrun', () => {
    let calls = 0;
    const report = checkClaims({ flow: onFlow(1, 0.1), claims: [slow, { id: 'next', kind: 'identity', lhs: '1', rhs: '1' }] }, { shouldStop: () => ++calls > 200 });
    expect(report.claims.map((c) => c.status)).toEqual(['inconclusive', 'inconclusive']);
    expect(report.claims[0]!.message).toContain('cancelled');
    expect(report.claims[1]!.message).toBe('cancelled before it ran');
  });

  it('an AbortSignal cancels an asynchronous run between claims', async () => {
    const controller = new AbortController();
    const claims = Array.from({ length: 6 }, (_, i) => ({ id: `c${i}`, kind: 'identity', lhs: 'x^2', rhs: 'x*x' }));
    const pending = checkClaimsAsync({ flow: onFlow(1, 0.1), claims }, { signal: controller.signal });
    await new Promise((resolve) => setTimeout(resolve, 0));
    controller.abort();
    const report = await pending;
    expect(report.claims).toHaveLength(6);
    expect(report.claims.some((c) => c.message === 'cancelled before it ran')).toBe(true);
  });
});

describe('randomly generated bad input never crashes or hangs the checker', () => {
  const token = fc.constantFrom('g', 'x', 'n', 'eps', '2', '0', '-1', '1e308', '+', '-', '*', '/', '^', '(', ')', 'sin(', 'ln(', 'gamma(', 'sqrt(', ',', '!', '=', '[', ']', 'pi', 'e', 'Infinity', 'NaN', ';', '.', 'a.b', '"s"', '?', ':', ' ');
  const expression = fc.oneof(fc.array(token, { maxLength: 12 }).map((parts) => parts.join('')), fc.string({ maxLength: 20 }), fc.double(), fc.constant(''));
  const value = fc.oneof(expression, fc.integer(), fc.constant(null), fc.constant({}), fc.constant([]));
  const claim = fc.record(
    {
      id: fc.oneof(fc.string({ maxLength: 5 }), fc.integer()),
      kind: fc.oneof(fc.constantFrom(...CLAIM_KINDS), fc.string({ maxLength: 6 })),
      lhs: value,
      rhs: value,
      variable: fc.oneof(fc.constantFrom('x', 'g', 'n', 'sin', ''), fc.string({ maxLength: 3 })),
      order: fc.oneof(fc.integer({ min: -3, max: 6 }), fc.double()),
      power: fc.oneof(fc.integer({ min: -1, max: 30 }), fc.double()),
      of: value,
      value: fc.oneof(value, fc.dictionary(fc.constantFrom('g', 'h'), value)),
      integrand: value,
      from: value,
      to: value,
      near: fc.oneof(fc.dictionary(fc.constantFrom('g', 'h'), value), value),
      quantity: value,
      eigenvalues: fc.array(value, { maxLength: 3 }),
      relevant: fc.integer({ min: -1, max: 3 }),
      tolerance: fc.oneof(fc.double(), fc.constant(-1)),
    },
    { requiredKeys: ['id', 'kind'] },
  );
  const flow = fc.record(
    {
      couplings: fc.oneof(fc.constant(['g']), fc.array(fc.constantFrom('g', 'h', 'sin', '1x'), { maxLength: 2 })),
      parameters: fc.dictionary(fc.constantFrom('n', 'eps', 'e', 'pi', 'g'), value),
      convention: fc.constantFrom('uv', 'ir', 'map', 'down'),
      beta: fc.dictionary(fc.constantFrom('g', 'h'), value),
      rates: fc.dictionary(fc.constantFrom('t', 'chi', 'g'), value),
    },
    { requiredKeys: [] },
  );

  it('every generated file gets either field errors or a status for every claim, within the time bound', () => {
    fc.assert(
      fc.property(flow, fc.array(claim, { maxLength: 4 }), (f, claims) => {
        const result = checkClaimFile({ flow: f, claims }, { timeLimitMs: 200 });
        if (!result.ok) {
          expect(result.errors.length).toBeGreaterThan(0);
          for (const error of result.errors) expect(error.message).toContain(error.field === '(file)' ? '' : error.field);
          return;
        }
        expect(result.report.claims).toHaveLength(claims.length);
        for (const c of result.report.claims) {
          expect(['holds', 'fails', 'inconclusive', 'invalid']).toContain(c.status);
          expect(c.message.length).toBeGreaterThan(0);
          expect(c.ms).toBeLessThan(2000);
          expect(c.message).not.toContain('stopped unexpectedly');
        }
      }),
      { numRuns: 300, seed: 20261201 },
    );
  });

  it('random expressions in a valid flow never crash the fixed-point, stability or epsilon checks', () => {
    fc.assert(
      fc.property(expression, expression, (beta, near) => {
        const report = checkClaimFile(
          {
            flow: { couplings: ['g'], parameters: { n: 1, eps: 0.1 }, convention: 'uv', beta: { g: typeof beta === 'number' ? beta : `-eps*g + ${beta}` } },
            claims: [
              { id: 'f', kind: 'fixed-point', near: { g: near } },
              { id: 's', kind: 'stability', near: { g: near }, relevant: 0 },
              { id: 'e', kind: 'epsilon-coefficient', quantity: 'g', near: { g: near }, power: 1, value: 0 },
            ],
          },
          { timeLimitMs: 200 },
        );
        if (!report.ok) {
          // e.g. a non-finite number where an expression is expected: refused with the field named
          expect(report.errors[0]!.message).toContain('flow.beta.g');
          return;
        }
        for (const c of report.report.claims) expect(c.message).not.toContain('stopped unexpectedly');
      }),
      { numRuns: 300, seed: 7 },
    );
  });
});

describe('random expressions in every plain claim kind', () => {
  const token = fc.constantFrom('x', 'y', 'n', '2', '0', '-1', '1e-300', '1e300', '+', '-', '*', '/', '^', '(', ')', 'sin(', 'ln(', 'gamma(', 'sqrt(', 'exp(', '!', 'pi', 'Infinity', ' ');
  const expression = fc.array(token, { minLength: 1, maxLength: 14 }).map((parts) => parts.join(''));
  const claim = fc.oneof(
    fc.record({ kind: fc.constant('identity'), lhs: expression, rhs: expression }),
    fc.record({ kind: fc.constant('order'), lhs: expression, rhs: expression, variable: fc.constant('x'), order: fc.integer({ min: 0, max: 5 }) }),
    fc.record({ kind: fc.constant('coefficient'), of: expression, variable: fc.constant('x'), power: fc.integer({ min: 0, max: 6 }), value: expression }),
    fc.record({ kind: fc.constant('integral'), integrand: expression, variable: fc.constant('x'), from: fc.constantFrom(0, '-Infinity', -1), to: fc.constantFrom(1, 'Infinity', 2), value: expression }),
  );

  it('each comes back with a status and a message, never an internal error, within the time bound', () => {
    fc.assert(
      fc.property(fc.array(claim, { minLength: 1, maxLength: 3 }), (claims) => {
        const result = checkClaimFile({ flow: onFlow(1, 0.1), claims: claims.map((c, i) => ({ id: `c${i}`, ...c })) }, { timeLimitMs: 300 });
        expect(result.ok).toBe(true);
        if (!result.ok) return;
        for (const c of result.report.claims) {
          expect(c.message.length).toBeGreaterThan(0);
          expect(c.message).not.toContain('stopped unexpectedly');
          expect(c.message).not.toContain('internal');
          expect(c.ms).toBeLessThan(1500);
        }
      }),
      { numRuns: 250, seed: 42 },
    );
  });
});
