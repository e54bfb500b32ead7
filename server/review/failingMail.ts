// "A claim that held now fails": from the background checks' verdicts-changed hook, each claim
// that turned from holds to fails is noted in the database and, a few minutes after the first one
// of a derivation, one mail goes to each of its authors listing every claim that turned meanwhile
// and still fails. Notes survive a restart; a claim that holds again before the mail leaves is left out.
import { and, asc, eq, inArray, isNull } from 'drizzle-orm';
import { getDb, schema } from '../../db/client';
import type { VerdictsChanged } from '../checks/access';
import { sendMail } from '../mail';
import { claimsTurnedFailingMail, type TurnedClaim } from '../mailTemplates';
import { peopleById } from './people';

/** The claims of a run that held before and fail now. */
export function turnedFailing(event: VerdictsChanged): VerdictsChanged['changes'] {
  return event.changes.filter((change) => change.before === 'holds' && change.after === 'fails');
}

export class FailingClaimMailer {
  private readonly timers = new Map<string, NodeJS.Timeout>();
  private sending: Promise<void> = Promise.resolve();
  private stopped = false;

  constructor(
    private readonly windowMs: number,
    private readonly origin: string,
  ) {}

  /** Schedules the mails of notes left by an earlier run of the server. */
  async start(): Promise<void> {
    const pending = await getDb()
      .select({ derivationId: schema.claimTurnNotices.derivationId, turnedAt: schema.claimTurnNotices.turnedAt })
      .from(schema.claimTurnNotices)
      .where(isNull(schema.claimTurnNotices.mailedAt))
      .orderBy(asc(schema.claimTurnNotices.turnedAt));
    const first = new Map<string, Date>();
    for (const row of pending) if (!first.has(row.derivationId)) first.set(row.derivationId, row.turnedAt);
    for (const [derivationId, turnedAt] of first) this.schedule(derivationId, turnedAt.getTime() + this.windowMs - Date.now());
  }

  stop(): void {
    this.stopped = true;
    for (const timer of this.timers.values()) clearTimeout(timer);
    this.timers.clear();
  }

  async note(event: VerdictsChanged): Promise<void> {
    const turned = turnedFailing(event);
    if (turned.length === 0 || this.stopped) return;
    await getDb()
      .insert(schema.claimTurnNotices)
      .values(
        turned.map((change) => ({
          derivationId: event.derivationId,
          stepId: change.stepId,
          claimId: change.claimId,
          kind: change.kind,
          message: change.message,
          editedBy: event.userIds,
          turnedAt: event.checkedAt,
        })),
      );
    this.schedule(event.derivationId, this.windowMs);
  }

  /** The first turn of a batch sets the time; later turns of the same derivation join it. */
  private schedule(derivationId: string, delayMs: number): void {
    if (this.stopped || this.timers.has(derivationId)) return;
    const timer = setTimeout(() => void this.sendNow(derivationId), Math.max(0, delayMs));
    timer.unref();
    this.timers.set(derivationId, timer);
  }

  /** Sends the derivation's pending notes as one mail per author (serialised with other sends). */
  sendNow(derivationId: string): Promise<void> {
    const timer = this.timers.get(derivationId);
    if (timer) clearTimeout(timer);
    this.timers.delete(derivationId);
    this.sending = this.sending.then(() =>
      this.send(derivationId).catch((error: unknown) => {
        console.error(`review: mailing the claims that turned failing in derivation ${derivationId} failed; trying again later:`, error);
        this.schedule(derivationId, this.windowMs);
      }),
    );
    return this.sending;
  }

  private async send(derivationId: string): Promise<void> {
    const db = getDb();
    const notes = await db
      .select()
      .from(schema.claimTurnNotices)
      .where(and(eq(schema.claimTurnNotices.derivationId, derivationId), isNull(schema.claimTurnNotices.mailedAt)))
      .orderBy(asc(schema.claimTurnNotices.turnedAt));
    if (notes.length === 0) return;
    const [derivation] = await db
      .select({ title: schema.derivations.title, groupId: schema.derivations.groupId, groupName: schema.groups.name, deletedAt: schema.derivations.deletedAt })
      .from(schema.derivations)
      .innerJoin(schema.groups, eq(schema.groups.id, schema.derivations.groupId))
      .where(eq(schema.derivations.id, derivationId));

    // Only claims still failing now, each once, in document order.
    const current = await db
      .select({ stepId: schema.claimChecks.stepId, claimId: schema.claimChecks.claimId, status: schema.claimChecks.status, position: schema.claimChecks.position })
      .from(schema.claimChecks)
      .where(and(eq(schema.claimChecks.derivationId, derivationId), inArray(schema.claimChecks.stepId, notes.map((n) => n.stepId))));
    const now = new Map(current.map((row) => [row.stepId, row]));
    const latest = new Map<string, (typeof notes)[number]>();
    for (const note of notes) latest.set(note.stepId, note);
    const failing = [...latest.values()]
      .filter((note) => now.get(note.stepId)?.status === 'fails')
      .sort((a, b) => (now.get(a.stepId)?.position ?? 0) - (now.get(b.stepId)?.position ?? 0));

    if (derivation && !derivation.deletedAt && failing.length > 0) {
      const recipients = await db
        .select({ email: schema.users.email })
        .from(schema.derivationAuthors)
        .innerJoin(schema.users, eq(schema.users.id, schema.derivationAuthors.userId))
        .innerJoin(
          schema.memberships,
          and(eq(schema.memberships.userId, schema.users.id), eq(schema.memberships.groupId, derivation.groupId)),
        )
        .where(eq(schema.derivationAuthors.derivationId, derivationId))
        .orderBy(asc(schema.derivationAuthors.addedAt));
      const editors = await peopleById(failing.flatMap((note) => note.editedBy));
      const claims: TurnedClaim[] = failing.map((note) => ({ name: now.get(note.stepId)?.claimId ?? note.claimId, kind: note.kind, message: note.message }));
      const mail = claimsTurnedFailingMail({
        derivationTitle: derivation.title,
        groupName: derivation.groupName,
        claims,
        editors: [...editors.values()].map((person) => person.name),
        // Opens the page at the first claim that turned.
        link: `${this.origin}/derivations/${derivationId}?step=${encodeURIComponent(failing[0]!.stepId)}`,
      });
      for (const recipient of recipients) await sendMail({ to: recipient.email, ...mail });
    }
    await db
      .update(schema.claimTurnNotices)
      .set({ mailedAt: new Date() })
      .where(inArray(schema.claimTurnNotices.id, notes.map((n) => n.id)));
  }
}
