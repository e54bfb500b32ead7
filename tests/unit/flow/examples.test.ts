import { describe, expect, it } from 'vitest';
import { readdirSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { join } from 'node:path';
import { checkClaimFile } from '../../../flow/runner';

const folder = fileURLToPath(new URL('../../../flow/examples', import.meta.url));

describe('the example claim files', () => {
  for (const name of readdirSync(folder).filter((file) => file.endsWith('.json'))) {
    it(`${name}: every claim holds`, () => {
      const result = checkClaimFile(JSON.parse(readFileSync(join(folder, name), 'utf8')));
      expect(result.ok).toBe(true);
      if (!result.ok) return;
      const notHolding = result.report.claims.filter((c) => c.status !== 'holds').map((c) => `${c.id}: ${c.status} ${c.message}`);
      expect(notHolding).toEqual([]);
    });
  }
});
