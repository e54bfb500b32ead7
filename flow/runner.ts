/**
 * Running the claims of a file: validation per claim, dispatch through the registry, a time bound
 * per claim, cancellation, and a report. Nothing a check throws leaves this module: every claim
 * comes back with a status and a message.
 */
import { parseClaim, parseClaimFile } from './claimFile';
import { CheckStopped, ClaimInputError, ExpressionError, describeError } from './errors';
import { type CompiledModel, compileModel, evaluateFlowParameters } from './model';
import { generator, hashString } from './numerics/random';
import { REGISTRY, type RegistryEntry } from './registry';
import { marginalSignFlag } from './sanity';
import { uncheckedResult } from './uncheckedResult';
import type {
  CheckContext,
  CheckOutcome,
  Claim,
  ClaimFile,
  ClaimKind,
  ClaimResult,
  FieldError,
  FlowSpec,
  Report,
  SanityFlag,
} from './types';

export interface CheckOptions {
  /** Time bound per claim in milliseconds (default 2000). */
  timeLimitMs?: number;
  /** Cancels the run: checked between claims and inside checks. */
  signal?: AbortSignal;
  /** Another way to cancel (e.g. a flag shared with a worker): checked like the signal. */
  shouldStop?: () => boolean;
  /** Tighter solver settings (a reviewer re-running a claim). */
  tight?: boolean;
  /** Check only the claims with these ids (the others are left out of the report). */
  only?: readonly string[];
}

export const DEFAULT_TIME_LIMIT_MS = 2000;

const clock = (): number => (typeof performance !== 'undefined' ? performance.now() : Date.now());

interface FlowState {
  model: CompiledModel | null;
  modelError: string | null;
  parameters: Record<string, number> | null;
  parameterError: string | null;
  sanity: Map<string, SanityFlag>;
}

function prepareFlow(spec: FlowSpec): FlowState {
  const state: FlowState = { model: null, modelError: null, parameters: null, parameterError: null, sanity: new Map() };
  try {
    state.model = compileModel(spec);
    state.parameters = { ...state.model.parameters };
  } catch (error) {
    state.modelError = describeError(error);
    try {
      state.parameters = evaluateFlowParameters(spec);
    } catch (parameterError) {
      state.parameterError = describeError(parameterError);
    }
  }
  return state;
}


function claimSettingsReader(claim: Claim, index: number) {
  return <T extends Record<string, number>>(defaults: T): T => {
    const given = claim.settings ?? {};
    for (const name of Object.keys(given)) {
      if (!(name in defaults)) {
        const field = `claims[${index}].settings.${name}`;
        throw new ClaimInputError(field, `${field}: unknown setting; settings of a ${claim.kind} claim: ${Object.keys(defaults).join(', ')}`);
      }
    }
    return { ...defaults, ...given } as T;
  };
}

function finish(outcome: CheckOutcome, id: string, kind: string, ms: number, extraSanity: SanityFlag[]): ClaimResult {
  // A check that judges marginality itself (along its own start) replaces the generic flag.
  const own = outcome.sanity ?? [];
  const general = own.some((flag) => flag.check === 'marginality') ? extraSanity.filter((flag) => flag.check !== 'marginal-sign') : extraSanity;
  return {
    id,
    kind,
    status: outcome.status,
    measured: outcome.measured ?? null,
    uncertainty: outcome.uncertainty ?? null,
    expected: outcome.expected ?? null,
    tolerance: outcome.tolerance ?? null,
    message: outcome.message,
    method: outcome.method,
    settings: outcome.settings ?? {},
    stats: outcome.stats ?? {},
    ms,
    sanity: [...general, ...own],
    evidence: outcome.evidence ?? {},
  };
}

function isCancelled(options: CheckOptions): boolean {
  return Boolean(options.signal?.aborted) || Boolean(options.shouldStop?.());
}

function flowSanity(state: FlowState, claim: Claim): SanityFlag[] {
  if (!state.model) return [];
  const parameter = 'parameter' in claim && typeof claim.parameter === 'string' ? claim.parameter : 'eps';
  let flag = state.sanity.get(parameter);
  if (!flag) {
    try {
      flag = marginalSignFlag(state.model, parameter);
    } catch (error) {
      flag = { check: 'marginal-sign', ok: false, message: `the marginal-sign check could not run: ${describeError(error)}` };
    }
    state.sanity.set(parameter, flag);
  }
  return [flag];
}

function runOne(raw: unknown, index: number, state: FlowState, options: CheckOptions): ClaimResult {
  const parsed = parseClaim(raw, index);
  if (!parsed.ok) return uncheckedResult(parsed.id, parsed.kind, 'invalid', parsed.errors.map((e) => e.message).join('; '));
  const claim = parsed.claim;
  const started = clock();
  const limit = options.timeLimitMs ?? DEFAULT_TIME_LIMIT_MS;
  const deadline = started + limit;
  const random = generator(hashString(`${claim.kind}:${claim.id}`));
  const ctx: CheckContext = {
    where: `claims[${index}]`,
    checkpoint() {
      if (isCancelled(options)) throw new CheckStopped('cancelled');
      if (clock() > deadline) throw new CheckStopped('time');
    },
    remainingMs: () => deadline - clock(),
    parameters: state.parameters ?? {},
    settings: claimSettingsReader(claim, index),
    tight: Boolean(options.tight),
    random,
  };
  const entry = REGISTRY[claim.kind as ClaimKind] as RegistryEntry;
  let sanity: SanityFlag[] = [];
  let outcome: CheckOutcome;
  try {
    if (entry.flow) {
      if (!state.model) throw new FlowUnusable(state.modelError ?? 'the flow could not be compiled');
      sanity = flowSanity(state, claim);
      outcome = entry.check(claim, state.model, ctx);
    } else {
      if (!state.parameters) throw new FlowUnusable(state.parameterError ?? 'the flow parameters could not be evaluated');
      outcome = entry.check(claim, ctx);
    }
  } catch (error) {
    outcome = outcomeOfError(error, limit);
  }
  return finish(outcome, claim.id, claim.kind, clock() - started, sanity);
}

class FlowUnusable extends Error {}

function outcomeOfError(error: unknown, limit: number): CheckOutcome {
  if (error instanceof CheckStopped) {
    return error.reason === 'time'
      ? { status: 'inconclusive', message: `stopped at the time bound of ${limit} ms before reaching a verdict`, method: 'stopped' }
      : { status: 'inconclusive', message: 'cancelled before reaching a verdict', method: 'stopped' };
  }
  if (error instanceof FlowUnusable) return { status: 'invalid', message: `the flow cannot be used: ${error.message}`, method: 'none' };
  if (error instanceof ExpressionError || error instanceof ClaimInputError) return { status: 'invalid', message: error.message, method: 'none' };
  if (error instanceof RangeError) return { status: 'inconclusive', message: `the check ran out of resources: ${error.message}`, method: 'none' };
  return { status: 'inconclusive', message: `the check stopped unexpectedly: ${describeError(error)}`, method: 'none' };
}

function summarise(results: ClaimResult[]): Report {
  const summary = { holds: 0, fails: 0, inconclusive: 0, invalid: 0 };
  for (const result of results) summary[result.status] += 1;
  return { claims: results, summary };
}

function duplicateIds(claims: readonly unknown[]): Map<number, string> {
  const firstIndex = new Map<string, number>();
  const duplicates = new Map<number, string>();
  claims.forEach((claim, index) => {
    const id = typeof claim === 'object' && claim !== null ? (claim as { id?: unknown }).id : undefined;
    if (typeof id !== 'string') return;
    const first = firstIndex.get(id);
    if (first === undefined) firstIndex.set(id, index);
    else duplicates.set(index, `claims[${index}].id: "${id}" is already the id of claims[${first}]`);
  });
  return duplicates;
}

function plan(file: ClaimFile, options: CheckOptions) {
  const state = prepareFlow(file.flow);
  const duplicates = duplicateIds(file.claims);
  const indices = file.claims
    .map((_, index) => index)
    .filter((index) => {
      if (!options.only) return true;
      const id = (file.claims[index] as { id?: unknown } | null)?.id;
      return typeof id === 'string' && options.only.includes(id);
    });
  const runAt = (index: number): ClaimResult => {
    const duplicate = duplicates.get(index);
    if (duplicate) {
      const raw = file.claims[index] as { id: string; kind?: unknown };
      return uncheckedResult(raw.id, typeof raw.kind === 'string' ? raw.kind : '', 'invalid', duplicate);
    }
    return runOne(file.claims[index], index, state, options);
  };
  const cancelledAt = (index: number): ClaimResult => {
    const raw = file.claims[index] as { id?: unknown; kind?: unknown } | null;
    const id = typeof raw?.id === 'string' ? raw.id : `claims[${index}]`;
    return uncheckedResult(id, typeof raw?.kind === 'string' ? raw.kind : '', 'inconclusive', 'cancelled before it ran');
  };
  return { indices, runAt, cancelledAt };
}

/** Check every claim of a file (synchronously). */
export function checkClaims(file: ClaimFile, options: CheckOptions = {}): Report {
  const { indices, runAt, cancelledAt } = plan(file, options);
  const results = indices.map((index) => (isCancelled(options) ? cancelledAt(index) : runAt(index)));
  return summarise(results);
}

/** One turn of the event loop without the clamping nested timers get in browsers (also the check worker's pause between claims). */
export function yieldToEventLoop(): Promise<void> {
  if (typeof MessageChannel === 'undefined') return new Promise((resolve) => setTimeout(resolve, 0));
  return new Promise((resolve) => {
    const channel = new MessageChannel();
    channel.port1.onmessage = () => {
      channel.port1.close();
      resolve();
    };
    channel.port2.postMessage(null);
  });
}

/** Like checkClaims, yielding to the event loop between claims so a cancel message can arrive. */
export async function checkClaimsAsync(file: ClaimFile, options: CheckOptions = {}): Promise<Report> {
  const { indices, runAt, cancelledAt } = plan(file, options);
  const results: ClaimResult[] = [];
  for (const index of indices) {
    await yieldToEventLoop();
    results.push(isCancelled(options) ? cancelledAt(index) : runAt(index));
  }
  return summarise(results);
}

export type FileCheck = { ok: true; report: Report } | { ok: false; errors: FieldError[] };

/** Validate unknown JSON as a claim file and check it. */
export function checkClaimFile(input: unknown, options: CheckOptions = {}): FileCheck {
  const parsed = parseClaimFile(input);
  if (!parsed.ok) return parsed;
  return { ok: true, report: checkClaims(parsed.file, options) };
}
