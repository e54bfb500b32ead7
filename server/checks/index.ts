// The background re-check's place in the one server process: a service started after the
// collaboration service (it reads the working copies through it). Other parts reach it through
// ./access (checksService()); stored results are read through ./results.
import { sql } from 'drizzle-orm';
import { getDb } from '../../db/client';
import { collab } from '../collab/access';
import type { Service } from '../extensions';
import { registerChecks } from './access';
import { CheckThread } from './checkThread';
import { CheckScheduler } from './scheduler';
import { readCheckSettings } from './settings';

let scheduler: CheckScheduler | null = null;

/** Derivations edited since their last check (e.g. before a crash), or never checked. */
async function derivationsNeedingCheck(): Promise<string[]> {
  const result = await getDb().execute<{ id: string }>(sql`
    select d.id from derivations d
    where d.deleted_at is null and (
      exists (select 1 from document_updates u where u.derivation_id = d.id
              and (d.claims_checked_at is null or u.created_at > d.claims_checked_at))
      or (d.claims_checked_at is null and exists (select 1 from document_snapshots s where s.derivation_id = d.id))
    )`);
  return result.rows.map((row) => row.id);
}

export const checksBackgroundService: Service = {
  name: 'background checks',
  async start() {
    const settings = readCheckSettings(process.env);
    const thread = new CheckThread({ timeLimitMs: settings.timeLimitMs });
    scheduler = new CheckScheduler(collab(), thread, settings);
    scheduler.start();
    registerChecks(scheduler);
    for (const id of await derivationsNeedingCheck()) scheduler.scheduleSoon(id);
  },
  async stop() {
    const stopping = scheduler;
    scheduler = null;
    registerChecks(undefined);
    await stopping?.stop();
  },
};

export { checksService, type ChecksAccess, type CheckedClaim, type DocumentCheck, type VerdictChange, type VerdictsChanged } from './access';
export { checksView, type ChecksView } from './results';
