import { describe, expect, it, afterEach } from 'vitest';
import { evaluate as mathEvaluate, derivative as mathDerivative } from 'mathjs';
import {
  compileScalar,
  differentiate,
  differentiateTimes,
  exactDifference,
  parseTerm,
  setCodeGeneration,
  splitAtZero,
  symbolsOf,
  evaluateBig,
  toBig,
} from '../../../flow/expr';
import { ExpressionError } from '../../../flow/errors';

// Expressions a physicist writes in beta functions, rates and identities.
const EXPRESSIONS = [
  '-eps*g + (n+8)/3*g^2 - (3*n+14)/3*g^3',
  '2g^2 + 3 g',
  '1/2g',
  'sqrt(1 + g^2) * exp(-g) / (1 + ln(1 + g))',
  'sin(g)^2 + cos(n*g) - tanh(g/3)',
  'log(g + 2, 3) + log10(g + 1) + abs(g - n) + atan2(g, n)',
  'g! + gamma(g + 0.5) + erf(g)',
  '(g + n)^(1/3) + cbrt(g) - expm1(g) + log1p(g)',
  '-g^-2 + e^g + pi*g',
];

function mathjsValue(source: string, scope: Record<string, number>): number {
  return mathEvaluate(source.replace(/\bln\(/g, 'log('), { ...scope }) as number;
}

describe('compiled expressions', () => {
  afterEach(() => setCodeGeneration(undefined));

  for (const mode of ['generated code', 'closures'] as const) {
    it(`agree with mathjs's own evaluation at many points (${mode})`, () => {
      setCodeGeneration(mode === 'generated code' ? undefined : false);
      for (const source of EXPRESSIONS) {
        const term = parseTerm(source, 'test', new Set(['g', 'n', 'eps']));
        const fn = compileScalar(term, ['g', 'n', 'eps']);
        for (const g of [0.1, 0.37, 1.3, 2.9]) {
          const scope = { g, n: 2, eps: 0.2 };
          // reference: mathjs evaluate on the same text (an independent evaluator)
          expect(fn([g, 2, 0.2])).toBeCloseTo(mathjsValue(source, scope), 12);
        }
      }
    });
  }

  it('reads implicit multiplication the mathjs way (2g^2 = 2*(g^2), 1/2g = g/2)', () => {
    const fn = compileScalar(parseTerm('2g^2', 't', new Set(['g'])), ['g']);
    expect(fn([3])).toBe(18);
    const half = compileScalar(parseTerm('1/2g', 't', new Set(['g'])), ['g']);
    expect(half([3])).toBe(mathEvaluate('1/2g', { g: 3 }));
  });

  it('treats e and pi as constants unless a parameter of that name is declared', () => {
    const free = parseTerm('e + pi', 't');
    expect(compileScalar(free, [])([])).toBeCloseTo(Math.E + Math.PI, 15);
    const shadowed = parseTerm('e + pi', 't', new Set(['e']));
    expect([...symbolsOf(shadowed)]).toEqual(['e']);
    expect(compileScalar(shadowed, ['e'])([10])).toBeCloseTo(10 + Math.PI, 14);
  });
});

describe('bad expressions get messages naming the expression and the position', () => {
  const message = (source: string, declared: string[] = []): string => {
    try {
      parseTerm(source, 'flow.beta.g', new Set(declared));
    } catch (error) {
      expect(error).toBeInstanceOf(ExpressionError);
      return (error as Error).message;
    }
    throw new Error(`no error for ${source}`);
  };

  it('a syntax error names the field, the text and the character', () => {
    const text = message('2*(g+');
    expect(text).toContain('flow.beta.g');
    expect(text).toContain('"2*(g+"');
    expect(text).toMatch(/character \d+/);
  });

  it('an unknown function names it and suggests a product when a coupling is called like a function', () => {
    expect(message('foo(g)', ['g'])).toContain('unknown function "foo"');
    expect(message('g(1 - g)', ['g'])).toContain('write g*(...)');
  });

  it('refuses constructs that are not arithmetic', () => {
    expect(message('a = 2')).toContain('assignments');
    expect(message('f(x) = x^2')).toContain('function definitions');
    expect(message('[1, 2]')).toContain('matrices');
    expect(message('x > 2')).toContain('comparisons');
    expect(message('"text"')).toContain('only numbers');
    expect(message('a.b')).toMatch(/property access|indexing/);
    expect(message('1; 2')).toContain('one expression');
    expect(message('5 mod 2')).toContain('operator');
    expect(message('(((((((((((((((((((((((((((((((((((((((((((((((((('.repeat(40))).toMatch(/nested too deeply|cannot read/);
  });
});

describe('symbolic derivatives', () => {
  it('match mathjs derivative with full simplification and a closed form derived by hand', () => {
    const source = '-eps*g + (n+8)/3*g^2 - (3*n+14)/3*g^3';
    const declared = new Set(['g', 'n', 'eps']);
    const d1 = compileScalar(differentiate(parseTerm(source, 't', declared), 'g', declared, 't'), ['g', 'n', 'eps']);
    const reference = mathDerivative(source, 'g');
    for (const g of [0.05, 0.3, 1.1]) {
      const scope = { g, n: 1, eps: 0.5 };
      const byHand = -0.5 + (2 * 9 * g) / 3 - 17 * g * g; // d/dg, common practice
      expect(d1([g, 1, 0.5])).toBeCloseTo(byHand, 13);
      expect(d1([g, 1, 0.5])).toBeCloseTo(reference.evaluate(scope) as number, 13);
    }
  });

  it('repeated derivatives stay exact for polynomials (fourth derivative of g^5 is 120 g)', () => {
    const term = differentiateTimes(parseTerm('g^5', 't', new Set(['g'])), 'g', 4, new Set(['g']), 't');
    expect(compileScalar(term, ['g'])([0.5])).toBe(60);
  });
});

describe('anomalous part of a rate', () => {
  const declared = new Set(['g', 'n']);
  const cases = [
    '2 - ((n+2)/3*g - 5*(n+2)/18*g^2)',
    'exp(2*g) * sqrt(1 + g) / (1 + g^2)',
    '(2 + g)^(1/3) + log(3 + g) - cos(1 + g)',
    '4 / (2 - g) + (1 + g)^n',
  ];
  for (const source of cases) {
    it(`${source}: rate(g) - rate(0) agrees with 40-digit arithmetic and stays accurate at g = 1e-30`, () => {
      const term = parseTerm(source, 't', declared);
      const split = splitAtZero(term, new Set(['g']));
      const anomalous = compileScalar(split.delta!, ['g', 'n']);
      for (const g of [0.3, 1e-3]) {
        const difference = evaluateBig(term, { g: toBig(g), n: toBig(2) })!.minus(evaluateBig(term, { g: toBig(0), n: toBig(2) })!);
        expect(Math.abs(anomalous([g, 2]) - difference.toNumber())).toBeLessThanOrEqual(1e-15 * Math.abs(difference.toNumber()));
      }
      // Deep in the infrared the float difference rate(g) - rate(0) would be exactly 0.
      const tiny = 1e-30;
      const slope = evaluateBig(term, { g: toBig('1e-20'), n: toBig(2) })!.minus(evaluateBig(term, { g: toBig(0), n: toBig(2) })!).div(toBig('1e-20'));
      expect(anomalous([tiny, 2]) / tiny).toBeCloseTo(slope.toNumber(), 8);
    });
  }
});

describe('exact algebra decides rational identities', () => {
  const decide = (a: string, b: string) => exactDifference(parseTerm(a, 'l'), parseTerm(b, 'r'));
  it('settles polynomial and rational identities', () => {
    expect(decide('(x+1)^2', 'x^2 + 2x + 1')).toBe('zero');
    expect(decide('1/(1-x) - 1/(1+x)', '2x/(1-x^2)')).toBe('zero');
    expect(decide('(a+b)^3', 'a^3 + 3a^2 b + 3 a b^2 + b^3')).toBe('zero');
    expect(decide('0.1 + 0.2', '0.3')).toBe('zero');
  });
  it('does not claim what it cannot prove', () => {
    expect(decide('(x+1)^2', 'x^2 + 2x + 2')).toBe('undecided');
    expect(decide('sin(x)^2 + cos(x)^2', '1')).toBe('undecided');
  });
});
