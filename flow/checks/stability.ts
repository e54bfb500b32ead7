/** The stability claim: eigenvalues of the linearised flow (or map) at a located fixed point, and the number of relevant directions. */
import { ClaimInputError } from '../errors';
import { describeFixedPoint } from '../fixedPoints';
import type { CompiledModel } from '../model';
import type { CheckOutcome, Complex, EigenvalueInput, FlowCheck, StabilityClaim, Status } from '../types';
import { couplingPoint, describePosition, evaluatePoint, fmt, fmtUncertainty, parameterValue, verdict } from './common';
import { LOCATE_DEFAULTS, locate, searchStats, summarizeFixedPoint, tightened } from './locate';

const DEFAULT_TOLERANCE = 1e-6;

const distance = (a: Complex, b: Complex): number => Math.hypot(a.re - b.re, a.im - b.im);

export function formatEigenvalue(z: Complex): string {
  if (z.im === 0) return fmt(z.re, 8);
  return `${fmt(z.re, 8)} ${z.im < 0 ? '-' : '+'} ${fmt(Math.abs(z.im), 8)}i`;
}

/** The assignment of claimed to computed eigenvalues with the smallest largest distance. */
export function matchEigenvalues(claimed: readonly Complex[], computed: readonly Complex[]): { worst: number; pairs: Array<[number, number]> } {
  let best = { worst: Number.POSITIVE_INFINITY, pairs: [] as Array<[number, number]> };
  const used = new Array<boolean>(computed.length).fill(false);
  const pairs: Array<[number, number]> = [];
  const exhaustive = computed.length <= 7;
  const visit = (i: number, worst: number): void => {
    if (worst >= best.worst) return;
    if (i === claimed.length) {
      best = { worst, pairs: [...pairs] };
      return;
    }
    const order = computed.map((_, j) => j).filter((j) => !used[j]).sort((a, b) => distance(claimed[i]!, computed[a]!) - distance(claimed[i]!, computed[b]!));
    for (const j of exhaustive ? order : order.slice(0, 1)) {
      used[j] = true;
      pairs.push([i, j]);
      visit(i + 1, Math.max(worst, distance(claimed[i]!, computed[j]!)));
      pairs.pop();
      used[j] = false;
    }
  };
  visit(0, 0);
  return best;
}

function claimedEigenvalue(input: EigenvalueInput, where: string, parameters: Readonly<Record<string, number>>): Complex {
  if (typeof input === 'object') return { re: parameterValue(input.re, `${where}.re`, parameters), im: parameterValue(input.im, `${where}.im`, parameters) };
  return { re: parameterValue(input, where, parameters), im: 0 };
}

export const checkStability: FlowCheck<StabilityClaim, CompiledModel> = (claim, model, ctx) => {
  const settings = tightened(ctx.settings(LOCATE_DEFAULTS), ctx.tight);
  const tolerance = claim.tolerance ?? DEFAULT_TOLERANCE;
  const where = ctx.where;
  if (model.dimension === 0) throw new ClaimInputError(`${where}.near`, `${where}: the flow has no couplings`);
  if (claim.eigenvalues === undefined && claim.relevant === undefined) {
    throw new ClaimInputError(`${where}.eigenvalues`, `${where}: give the claimed eigenvalues, the number of relevant directions (relevant), or both`);
  }
  if (claim.form !== undefined && model.convention !== 'map') {
    throw new ClaimInputError(`${where}.form`, `${where}.form: only for maps (convention "map"); a flow's eigenvalues are given in the infrared convention`);
  }
  if (claim.eigenvalues && claim.eigenvalues.length > model.dimension) {
    throw new ClaimInputError(`${where}.eigenvalues`, `${where}.eigenvalues: ${claim.eigenvalues.length} eigenvalues claimed, but the flow has ${model.dimension} coupling${model.dimension === 1 ? '' : 's'}`);
  }
  const point = model.at();
  const guess = evaluatePoint(couplingPoint(claim.near, `${where}.near`, model), point);
  const found = locate(model, point, guess, [], settings, ctx);
  const settingsRecord = { ...settings, tolerance };
  if (!found.ok) return { ...found.outcome, settings: settingsRecord, tolerance };
  const { x, info, infos, search, uncertainty, sanity } = found.located;
  if (info.eigenvalues.length === 0) {
    return { status: 'inconclusive', message: 'the eigenvalue iteration did not converge at the fixed point', method: 'Hessenberg QR', settings: settingsRecord, sanity };
  }
  const useExponents = model.convention === 'map' && claim.form === 'y';
  const computed: Complex[] = useExponents ? info.exponents!.map((y) => ({ re: y, im: 0 })) : info.eigenvalues;

  // How much the eigenvalues move within the position uncertainty.
  let spread = 1e-13 * (1 + Math.max(...computed.map((z) => Math.hypot(z.re, z.im))));
  for (let i = 0; i < x.length; i++) {
    const shifted = Float64Array.from(x);
    shifted[i]! += uncertainty;
    const other = describeFixedPoint(model, point, shifted, settings.marginal);
    const values = useExponents ? (other.exponents ?? []).map((y) => ({ re: y, im: 0 })) : other.eigenvalues;
    if (values.length === computed.length) spread = Math.max(spread, matchEigenvalues(computed, values).worst);
  }

  let status: Status = 'holds';
  const parts: string[] = [];
  const label = useExponents ? 'exponents y = ln|lambda|' : model.convention === 'map' ? 'eigenvalues of the map' : 'eigenvalues (infrared: positive = relevant)';
  const head = `at the fixed point ${describePosition(model, x)} the ${label} are ${computed.map(formatEigenvalue).join(', ')} (${summarizeFixedPoint(info)})`;
  let claimed: Complex[] = [];
  if (claim.eigenvalues) {
    claimed = claim.eigenvalues.map((input, i) => claimedEigenvalue(input, `${where}.eigenvalues[${i}]`, point.parameters));
    const match = matchEigenvalues(claimed, computed);
    status = verdict(match.worst, spread, tolerance);
    parts.push(
      status === 'holds'
        ? `the claimed ${claimed.map(formatEigenvalue).join(', ')} match within ${fmt(tolerance)}`
        : status === 'fails'
          ? `the claimed ${claimed.map(formatEigenvalue).join(', ')} do not match (largest difference ${fmt(match.worst, 4)}, tolerance ${fmt(tolerance)})`
          : `the claimed eigenvalues differ by ${fmt(match.worst, 4)}, which the uncertainty ${fmtUncertainty(spread)} cannot settle against tolerance ${fmt(tolerance)}`,
    );
  }
  if (claim.relevant !== undefined) {
    const marginal = info.classification.filter((c) => c === 'marginal').length;
    if (claim.relevant !== info.relevant) {
      const possible = claim.relevant >= info.relevant && claim.relevant <= info.relevant + marginal;
      if (possible) {
        if (status === 'holds') status = 'inconclusive';
        parts.push(`${claim.relevant} relevant directions claimed: ${info.relevant} are relevant and ${marginal} marginal, which linear order cannot settle`);
      } else {
        status = 'fails';
        parts.push(`${claim.relevant} relevant direction${claim.relevant === 1 ? '' : 's'} claimed, but ${info.relevant} ${info.relevant === 1 ? 'is' : 'are'} relevant`);
      }
    } else {
      parts.push(`${info.relevant} relevant direction${info.relevant === 1 ? '' : 's'}, as claimed`);
    }
  }
  const asMeasured = (z: Complex): number | Complex => (z.im === 0 ? z.re : z);
  const outcome: CheckOutcome = {
    status,
    message: `${head}; ${parts.join('; ')}`,
    method: 'fixed point by Newton with the symbolic Jacobian; eigenvalues by Hessenberg reduction and shifted QR',
    measured: computed.map(asMeasured),
    expected: claimed.length > 0 ? claimed.map(asMeasured) : null,
    uncertainty: spread,
    tolerance,
    settings: settingsRecord,
    stats: searchStats(search),
    sanity,
    evidence: { fixedPoints: infos },
  };
  return outcome;
};
