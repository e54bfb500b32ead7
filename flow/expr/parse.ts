/**
 * Parsing user expressions with mathjs and turning the parse tree into a Term through a whitelist
 * of node types and functions. Nothing here evaluates user text.
 */
import { parse as mathParse, type MathNode } from 'mathjs';
import { ExpressionError } from '../errors';
import { CONSTANTS, FUNCTIONS, FUNCTION_ALIASES } from './functions';
import { type Term, num, neg, add, sub, mul, div, pow, symbolsOf } from './term';
import { BoundedCache } from './cache';

const MAX_LENGTH = 20_000;
const MAX_DEPTH = 400;

const parseCache = new BoundedCache<string, MathNode>(4000);
const termCache = new BoundedCache<string, Term>(8000);

/** 1-based position of the first whole-word occurrence of `name` in `source`, if any. */
export function positionOf(source: string, name: string): number | undefined {
  const escaped = name.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');
  const match = new RegExp(`(?<![A-Za-z0-9_])${escaped}(?![A-Za-z0-9_])`).exec(source);
  return match ? match.index + 1 : undefined;
}

function quote(source: string): string {
  return source.length > 80 ? `"${source.slice(0, 77)}..."` : `"${source}"`;
}

function parseSource(source: string, where: string): MathNode {
  const cached = parseCache.get(source);
  if (cached) return cached;
  if (source.trim() === '') throw new ExpressionError(`${where}: the expression is empty`, where, source);
  if (source.length > MAX_LENGTH) {
    throw new ExpressionError(`${where}: the expression is longer than ${MAX_LENGTH} characters`, where, source);
  }
  let node: MathNode;
  try {
    node = mathParse(source);
  } catch (error) {
    if (error instanceof RangeError) {
      throw new ExpressionError(`${where}: the expression ${quote(source)} is nested too deeply`, where, source);
    }
    const raw = error instanceof Error ? error.message : String(error);
    const charField = (error as { char?: unknown }).char;
    const position = typeof charField === 'number' ? charField : undefined; // mathjs counts from 1
    const reason = raw.replace(/\s*\(char \d+\)\s*$/, '');
    const at = position === undefined ? '' : ` at character ${position}`;
    throw new ExpressionError(
      `${where}: cannot read ${quote(source)}: ${reason.charAt(0).toLowerCase()}${reason.slice(1)}${at}`,
      where,
      source,
      position,
    );
  }
  parseCache.set(source, node);
  return node;
}

const OPERATORS: Readonly<Record<string, (args: Term[]) => Term>> = {
  add: ([a, b]) => add(a!, b!),
  subtract: ([a, b]) => sub(a!, b!),
  multiply: ([a, b]) => mul(a!, b!),
  divide: ([a, b]) => div(a!, b!),
  pow: ([a, b]) => pow(a!, b!),
  unaryMinus: ([a]) => neg(a!),
  unaryPlus: ([a]) => a!,
  factorial: ([a]) => ({ t: 'call', f: 'factorial', args: [a!] }),
};

const REFUSED: Readonly<Record<string, string>> = {
  AssignmentNode: 'assignments (=) are not allowed',
  FunctionAssignmentNode: 'function definitions are not allowed',
  BlockNode: 'write one expression (no ";" or line breaks between expressions)',
  ConditionalNode: 'the conditional "a ? b : c" is not allowed',
  RelationalNode: 'comparisons are not allowed',
  ArrayNode: 'vectors and matrices are not allowed',
  AccessorNode: 'indexing and property access are not allowed',
  IndexNode: 'indexing is not allowed',
  ObjectNode: 'objects are not allowed',
  RangeNode: 'ranges (a:b) are not allowed',
};

interface ConvertScope {
  source: string;
  where: string;
  declared: ReadonlySet<string>;
}

function fail(scope: ConvertScope, message: string, symbol?: string): never {
  const position = symbol === undefined ? undefined : positionOf(scope.source, symbol);
  const at = position === undefined ? '' : ` (character ${position})`;
  throw new ExpressionError(`${scope.where}: ${message}${at}`, scope.where, scope.source, position, symbol);
}

function convert(node: MathNode, scope: ConvertScope, depth: number): Term {
  if (depth > MAX_DEPTH) fail(scope, `the expression ${quote(scope.source)} is nested too deeply`);
  const any = node as MathNode & Record<string, unknown>;
  switch (node.type) {
    case 'ParenthesisNode':
      return convert(any.content as MathNode, scope, depth + 1);
    case 'ConstantNode': {
      const value = any.value;
      if (typeof value !== 'number') fail(scope, `only numbers are allowed as constants, not ${JSON.stringify(value)}`);
      return num(value);
    }
    case 'SymbolNode': {
      const name = any.name as string;
      if (scope.declared.has(name)) return { t: 'sym', name };
      if (name in CONSTANTS) return { t: 'const', name, v: CONSTANTS[name]! };
      if (name in FUNCTIONS || name in FUNCTION_ALIASES) fail(scope, `"${name}" is a function; write ${name}(x)`, name);
      return { t: 'sym', name };
    }
    case 'OperatorNode': {
      const fn = any.fn as string;
      const build = OPERATORS[fn];
      if (!build) {
        const comparison = ['equal', 'unequal', 'smaller', 'larger', 'smallerEq', 'largerEq'].includes(fn);
        fail(scope, comparison ? 'comparisons are not allowed' : `the operator "${String(any.op)}" is not allowed (use + - * / ^ and !)`);
      }
      const args = (any.args as MathNode[]).map((arg) => convert(arg, scope, depth + 1));
      return build(args);
    }
    case 'FunctionNode': {
      const fnNode = any.fn as MathNode & { name?: unknown };
      if (fnNode.type !== 'SymbolNode' || typeof fnNode.name !== 'string') fail(scope, 'only named functions may be called');
      const written = fnNode.name;
      const name = FUNCTION_ALIASES[written] ?? written;
      const spec = FUNCTIONS[name];
      if (!spec) {
        const hint = `if you meant a product, write ${written}*(...)`;
        if (scope.declared.has(written)) fail(scope, `"${written}(...)" reads as a call of a function ${written}; ${hint}`, written);
        if (written in CONSTANTS) fail(scope, `"${written}" is a constant, not a function`, written);
        fail(scope, `unknown function "${written}"; ${hint}. Functions: ${Object.keys(FUNCTIONS).join(', ')}, ln`, written);
      }
      const args = (any.args as MathNode[]).map((arg) => convert(arg, scope, depth + 1));
      if (args.length < spec.minArgs || args.length > spec.maxArgs) {
        const wanted = spec.minArgs === spec.maxArgs ? `${spec.minArgs}` : `${spec.minArgs} to ${spec.maxArgs}`;
        fail(scope, `${written} takes ${wanted} argument${spec.maxArgs === 1 ? '' : 's'}, not ${args.length}`, written);
      }
      return { t: 'call', f: name, args };
    }
    default:
      fail(scope, `${REFUSED[node.type] ?? `"${node.type}" is not allowed`} in ${quote(scope.source)}`);
  }
}

/**
 * Parse an expression (or take a number) into a Term. `declared` names (parameters, couplings,
 * rates, variables) shadow the constants pi and e. Symbols are not checked here: see requireKnown.
 */
export function parseTerm(input: number | string, where: string, declared: ReadonlySet<string> = new Set()): Term {
  if (typeof input === 'number') {
    if (Number.isNaN(input)) throw new ExpressionError(`${where}: the value is not a number`, where, String(input));
    return num(input);
  }
  const key = `${[...declared].sort().join(',')}\u0000${input}`;
  const cached = termCache.get(key);
  if (cached) return cached;
  const node = parseSource(input, where);
  const term = convert(node, { source: input, where, declared }, 0);
  termCache.set(key, term);
  return term;
}

/** A Term from a mathjs tree that flow/ produced itself (e.g. a derivative), through the same whitelist. */
export function nodeToTerm(node: MathNode, where: string, declared: ReadonlySet<string>): Term {
  return convert(node, { source: node.toString(), where, declared }, 0);
}

/** The mathjs parse tree of a source (cached), for callers that need mathjs itself. */
export function parseNode(source: string, where: string): MathNode {
  return parseSource(source, where);
}

/**
 * Refuse symbols that are not allowed, naming the symbol and where allowed symbols come from,
 * e.g. "may use the couplings (g), the parameters (n, eps) and the rate names (t)".
 */
export function requireKnown(term: Term, source: string, where: string, allowed: ReadonlySet<string>, origin: string): void {
  for (const name of symbolsOf(term)) {
    if (allowed.has(name)) continue;
    const position = positionOf(source, name);
    const at = position === undefined ? '' : ` (character ${position})`;
    throw new ExpressionError(`${where}: unknown symbol "${name}"${at}; ${origin}`, where, source, position, name);
  }
}
