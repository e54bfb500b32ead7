/**
 * The command line: `npm run --silent check -- FILE [--tight] [--time-limit MS] [--only ID]`.
 * Prints the JSON check report on stdout. Exit 0 when every claim holds, 1 when any does not,
 * 2 when the file cannot be read or does not match the format (the message names the field).
 * The only module of flow/ that uses Node APIs.
 */
import { readFileSync } from 'node:fs';
import { checkClaimFile } from './runner';

const USAGE = 'usage: npm run --silent check -- FILE [--tight] [--time-limit MS] [--only ID ...]   (FILE "-" reads standard input)';

interface Arguments {
  file: string;
  tight: boolean;
  timeLimitMs?: number;
  only: string[];
}

function parseArguments(argv: readonly string[]): Arguments | string {
  let file: string | undefined;
  let tight = false;
  let timeLimitMs: number | undefined;
  const only: string[] = [];
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i]!;
    if (arg === '--tight') tight = true;
    else if (arg === '--time-limit') {
      const value = Number(argv[++i]);
      if (!(value > 0)) return '--time-limit needs a positive number of milliseconds';
      timeLimitMs = value;
    } else if (arg === '--only') {
      const id = argv[++i];
      if (!id) return '--only needs a claim id';
      only.push(id);
    } else if (arg === '--help' || arg === '-h') return USAGE;
    else if (arg.startsWith('--')) return `unknown option ${arg}`;
    else if (file === undefined) file = arg;
    else return `one file at a time (got ${file} and ${arg})`;
  }
  if (file === undefined) return 'no file given';
  return { file, tight, ...(timeLimitMs === undefined ? {} : { timeLimitMs }), only };
}

function fail(errors: Array<{ field: string; message: string }>): never {
  for (const error of errors) process.stderr.write(`${error.message}\n`);
  process.stdout.write(`${JSON.stringify({ errors }, null, 2)}\n`);
  process.exit(2);
}

function main(): void {
  const args = parseArguments(process.argv.slice(2));
  if (typeof args === 'string') {
    process.stderr.write(args === USAGE ? `${USAGE}\n` : `${args}\n${USAGE}\n`);
    process.exit(2);
  }
  let text: string;
  try {
    text = readFileSync(args.file === '-' ? 0 : args.file, 'utf8');
  } catch (error) {
    const reason = error instanceof Error ? error.message : String(error);
    fail([{ field: '(file)', message: `cannot read ${args.file}: ${reason}` }]);
  }
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (error) {
    const reason = error instanceof Error ? error.message : String(error);
    fail([{ field: '(file)', message: `${args.file} is not valid JSON: ${reason}` }]);
  }
  const result = checkClaimFile(json, {
    tight: args.tight,
    ...(args.timeLimitMs === undefined ? {} : { timeLimitMs: args.timeLimitMs }),
    ...(args.only.length > 0 ? { only: args.only } : {}),
  });
  if (!result.ok) fail(result.errors);
  process.stdout.write(`${JSON.stringify(result.report, null, 2)}\n`);
  const { summary } = result.report;
  process.exitCode = summary.fails + summary.inconclusive + summary.invalid === 0 ? 0 : 1;
}

main();
