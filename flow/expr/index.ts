/** Expressions: parse (mathjs, whitelisted), compile to plain functions, differentiate, split, decide. */
export { parseTerm, parseNode, nodeToTerm, requireKnown, positionOf } from './parse';
export { compileScalar, compileVector, setCodeGeneration, type ScalarFunction, type VectorFunction } from './compile';
export { differentiate, differentiateTimes, fold } from './derivative';
export { splitAtZero, type SplitTerm } from './split';
export { exactDifference } from './exact';
export { evaluateBig, toBig, bigToNumber, bigClose, bigAbsDifference, BIG_DIGITS, type Big } from './big';
export { CONSTANTS, FUNCTIONS, FUNCTION_ALIASES, isReservedName } from './functions';
export * from './term';
