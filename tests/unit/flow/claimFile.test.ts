import { describe, expect, it } from 'vitest';
import { parseClaim, parseClaimFile } from '../../../flow/claimFile';

describe('reading a claim file', () => {
  it('accepts a flow with no couplings for claims that need none', () => {
    const parsed = parseClaimFile({ flow: { couplings: [], beta: {} }, claims: [] });
    expect(parsed.ok).toBe(true);
  });

  it('names the field that is wrong in the file shape', () => {
    const parsed = parseClaimFile({ flow: { couplings: 'g', paramters: {} }, claims: {} });
    expect(parsed.ok).toBe(false);
    if (parsed.ok) return;
    const fields = parsed.errors.map((e) => e.field);
    expect(fields).toEqual(expect.arrayContaining(['flow.couplings', 'flow.paramters', 'claims']));
    expect(parsed.errors.find((e) => e.field === 'flow.paramters')?.message).toContain('unknown field');
  });

  it('requires a convention once the flow has couplings', () => {
    const parsed = parseClaimFile({ flow: { couplings: ['g'], beta: { g: 'g' } }, claims: [] });
    expect(parsed.ok).toBe(false);
    if (!parsed.ok) expect(parsed.errors[0]!.field).toBe('flow.convention');
  });

  it('rejects a file that is not an object', () => {
    for (const input of [null, 3, 'text', []]) expect(parseClaimFile(input).ok).toBe(false);
  });

  it('validates each claim on its own and names the missing field', () => {
    const parsed = parseClaim({ id: 'fp', kind: 'fixed-point' }, 4);
    expect(parsed.ok).toBe(false);
    if (!parsed.ok) expect(parsed.errors[0]!.message).toBe('claims[4].near: missing (required)');
  });

  it('names an unknown kind and lists the kinds', () => {
    const parsed = parseClaim({ id: 'x', kind: 'fixpoint' }, 0);
    expect(parsed.ok).toBe(false);
    if (!parsed.ok) expect(parsed.errors[0]!.message).toMatch(/"fixpoint" is not a claim kind; kinds: identity, order/);
  });

  it('refuses misspelt optional fields instead of ignoring them', () => {
    const parsed = parseClaim({ id: 'x', kind: 'identity', lhs: '1', rhs: '1', tolerence: 1e-3 }, 1);
    expect(parsed.ok).toBe(false);
    if (!parsed.ok) expect(parsed.errors[0]!.field).toBe('claims[1].tolerence');
  });

  it('accepts numbers written as expressions wherever a value is', () => {
    const parsed = parseClaim({ id: 'i', kind: 'integral', integrand: 'x^3/(exp(x)-1)', variable: 'x', from: 0, to: 'Infinity', value: 'pi^4/15' }, 0);
    expect(parsed.ok).toBe(true);
  });
});
