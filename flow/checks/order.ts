/** The order claim: lhs = rhs + O(x^k) as x -> 0+, from the slope of ln|lhs - rhs| against ln x. */
import { ClaimInputError } from '../errors';
import { BIG_DIGITS, type Big, compileScalar, evaluateBig, exactDifference, toBig } from '../expr';
import { checkName } from '../model';
import type { OrderClaim, PlainCheck, Status } from '../types';
import { fmt, fmtMeasurement } from './common';
import { DEFAULT_DOMAIN, domainsFor, parseSides } from './compare';

const DEFAULTS = { start: 0.1, ratio: 0.5, points: 16, slack: 0.25, tail: 6 };
const EPSILON = 2.220446049250313e-16;

export const checkOrder: PlainCheck<OrderClaim> = (claim, ctx) => {
  const settings = ctx.settings(DEFAULTS);
  if (ctx.tight) settings.points += 12;
  const where = ctx.where;
  checkName(claim.variable, `${where}.variable`, 'variable');
  if (claim.variable in ctx.parameters) throw new ClaimInputError(`${where}.variable`, `${where}.variable: "${claim.variable}" is a parameter of the flow, not a free variable`);
  if (!(settings.ratio > 0 && settings.ratio < 1) || !(settings.start > 0)) {
    throw new ClaimInputError(`${where}.settings`, `${where}.settings: start must be positive and ratio between 0 and 1`);
  }
  const { terms, variables } = parseSides(
    [
      [claim.lhs, `${where}.lhs`],
      [claim.rhs, `${where}.rhs`],
    ],
    ctx,
  );
  const [lhs, rhs] = terms as [(typeof terms)[0], (typeof terms)[0]];
  const others = variables.filter((name) => name !== claim.variable);
  const domains = domainsFor(others, claim.domain, ctx);
  const settingsRecord = { ...settings, tolerance: settings.slack };
  const base = { method: '', settings: settingsRecord, expected: claim.order, tolerance: settings.slack };
  if (exactDifference(lhs, rhs) === 'zero') {
    return { ...base, status: 'holds', message: 'lhs - rhs is identically zero (exact algebra)', method: 'exact algebra', measured: null };
  }
  // The other free variables are held at one point from the fixed random start.
  const fixed: Record<string, number> = {};
  for (const name of others) {
    const [a, b] = domains.get(name) ?? [...DEFAULT_DOMAIN];
    fixed[name] = Number((a + (b - a) * (0.02 + 0.96 * ctx.random())).toPrecision(12));
  }
  const parameterNames = Object.keys(ctx.parameters);
  const slots = [claim.variable, ...others, ...parameterNames];
  const left = compileScalar(lhs, slots);
  const right = compileScalar(rhs, slots);
  let highPrecision = true;
  const bigFixed: Record<string, Big> = {};
  for (const [name, value] of Object.entries({ ...fixed, ...ctx.parameters })) bigFixed[name] = toBig(value);

  const samples: Array<[number, number]> = [];
  let belowNoise = 0;
  let undefinedPoints = 0;
  for (let j = 0; j < settings.points; j++) {
    ctx.checkpoint();
    const x = settings.start * Math.pow(settings.ratio, j);
    let difference: number | null = null;
    let scale = 0;
    const vector = [x, ...others.map((name) => fixed[name]!), ...parameterNames.map((name) => ctx.parameters[name]!)];
    const lDouble = left(vector);
    const rDouble = right(vector);
    if (!Number.isFinite(lDouble) || !Number.isFinite(rDouble)) {
      // Not a real number here (or beyond double range, where high precision could take very long).
      undefinedPoints++;
      continue;
    }
    if (highPrecision) {
      try {
        const values = { ...bigFixed, [claim.variable]: toBig(x) };
        const l = evaluateBig(lhs, values);
        const r = evaluateBig(rhs, values);
        if (l && r) {
          const d = l.minus(r).abs();
          difference = d.toNumber();
          scale = Math.max(Math.abs(l.toNumber()), Math.abs(r.toNumber())) * Math.pow(10, 4 - BIG_DIGITS);
        }
      } catch {
        highPrecision = false;
        j = -1;
        samples.length = 0;
        belowNoise = 0;
        undefinedPoints = 0;
        continue;
      }
    } else {
      difference = Math.abs(lDouble - rDouble);
      scale = 1e3 * EPSILON * Math.max(Math.abs(lDouble), Math.abs(rDouble));
    }
    if (difference === null || !Number.isFinite(difference)) {
      undefinedPoints++;
      continue;
    }
    if (difference <= scale) {
      belowNoise++;
      continue;
    }
    samples.push([x, difference]);
  }
  const precision = highPrecision ? `${BIG_DIGITS}-digit precision` : 'double precision (a function has no high-precision form in mathjs)';
  const stats = { used: samples.length, belowRounding: belowNoise, undefined: undefinedPoints, precision: highPrecision ? 'high' : 'double' };
  base.method = `|lhs - rhs| on x = ${fmt(settings.start)} * ${fmt(settings.ratio)}^j in ${precision}; log-log slope over the smallest ${settings.tail} usable x`;
  if (samples.length === 0 && belowNoise > 0) {
    return { ...base, status: 'holds', message: `lhs - rhs vanishes to rounding at every sampled ${claim.variable}`, measured: null, stats };
  }
  if (samples.length < 4) {
    return { ...base, status: 'inconclusive', message: `only ${samples.length} usable values of ${claim.variable} (the others were undefined or below rounding)`, stats };
  }
  const tail = samples.slice(-Math.max(3, Math.min(settings.tail, samples.length)));
  const logs = tail.map(([x, d]) => [Math.log(x), Math.log(d)] as const);
  const mx = logs.reduce((s, [u]) => s + u, 0) / logs.length;
  const my = logs.reduce((s, [, v]) => s + v, 0) / logs.length;
  const slope = logs.reduce((s, [u, v]) => s + (u - mx) * (v - my), 0) / logs.reduce((s, [u]) => s + (u - mx) ** 2, 0);
  const local = logs.slice(1).map(([u, v], i) => (v - logs[i]![1]) / (u - logs[i]![0]));
  const uncertainty = Math.max(...local.map((s) => Math.abs(s - slope)));
  const needed = claim.order - settings.slack;
  const status: Status = slope - uncertainty >= needed ? 'holds' : slope + uncertainty < needed ? 'fails' : 'inconclusive';
  const [xLast, dLast] = samples[samples.length - 1]!;
  const ratio = dLast / Math.pow(xLast, claim.order);
  const message =
    status === 'holds'
      ? `|lhs - rhs| falls like ${claim.variable}^${fmt(slope, 4)} (at least ${claim.variable}^${fmt(claim.order)}); (lhs - rhs)/${claim.variable}^${fmt(claim.order)} = ${fmt(ratio, 4)} at ${claim.variable} = ${fmt(xLast, 4)}`
      : status === 'fails'
        ? `|lhs - rhs| falls only like ${claim.variable}^${fmt(slope, 4)}, not ${claim.variable}^${fmt(claim.order)}: the difference is O(${claim.variable}^${Math.round(slope)})`
        : `the slope ${fmtMeasurement(slope, uncertainty, 4)} is too uncertain to settle order ${fmt(claim.order)}`;
  return {
    ...base,
    status,
    message,
    measured: slope,
    uncertainty,
    stats,
    evidence: {
      values: { ratioAtSmallest: ratio },
      plots: [
        {
          title: `|lhs - rhs| against ${claim.variable}`,
          xLabel: claim.variable,
          yLabel: '|lhs - rhs|',
          xScale: 'log',
          yScale: 'log',
          series: [
            { name: '|lhs - rhs|', points: samples, style: 'points' },
            { name: `slope ${fmt(claim.order)}`, points: samples.map(([x]) => [x, dLast * Math.pow(x / xLast, claim.order)]), style: 'line' },
          ],
        },
      ],
    },
  };
};
