import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('../../..', import.meta.url));
const tsx = join(root, 'node_modules', '.bin', 'tsx');
const folder = mkdtempSync(join(tmpdir(), 'marginalia-cli-'));

function check(...args: string[]) {
  const result = spawnSync(tsx, [join(root, 'flow', 'cli.ts'), ...args], { cwd: root, encoding: 'utf8', timeout: 60_000 });
  return { code: result.status, stdout: result.stdout, stderr: result.stderr };
}

function file(name: string, content: unknown): string {
  const path = join(folder, name);
  writeFileSync(path, typeof content === 'string' ? content : JSON.stringify(content));
  return path;
}

describe('the check command', { timeout: 60_000 }, () => {
  it('prints the report of the worked example and exits 0 when every claim holds', () => {
    const { code, stdout } = check('flow/examples/on-model.json');
    expect(code).toBe(0);
    const report = JSON.parse(stdout);
    expect(report.summary.fails + report.summary.inconclusive + report.summary.invalid).toBe(0);
    expect(report.claims.length).toBeGreaterThan(5);
    for (const claim of report.claims) {
      for (const field of ['id', 'kind', 'status', 'measured', 'uncertainty', 'expected', 'message', 'method', 'ms']) expect(claim).toHaveProperty(field);
    }
  });

  it('exits 1 when a claim does not hold', () => {
    const path = file('fails.json', { flow: { couplings: [], beta: {} }, claims: [{ id: 'wrong', kind: 'integral', integrand: 'x', variable: 'x', from: 0, to: 1, value: 0.6 }] });
    const { code, stdout } = check(path);
    expect(code).toBe(1);
    expect(JSON.parse(stdout).claims[0].status).toBe('fails');
  });

  it('exits 2 with a message naming the field when the file does not match the format', () => {
    const path = file('malformed.json', { flow: { couplings: ['g'], beta: { g: 'g' } }, claims: [] });
    const { code, stderr, stdout } = check(path);
    expect(code).toBe(2);
    expect(stderr).toContain('flow.convention');
    expect(JSON.parse(stdout).errors[0].field).toBe('flow.convention');
  });

  it('exits 2 when the file cannot be read or is not JSON', () => {
    const missing = check(join(folder, 'no-such-file.json'));
    expect(missing.code).toBe(2);
    expect(missing.stderr).toContain('cannot read');
    const broken = check(file('broken.json', '{ "flow": '));
    expect(broken.code).toBe(2);
    expect(broken.stderr).toContain('is not valid JSON');
  });
});
