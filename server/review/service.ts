// Review's place in the one server process: after every committed edit it notes who wrote which
// step and compares the standing sign-offs of the derivation with its working copy (clearing
// those whose step or flow block changed); from the background checks' verdicts-changed hook it
// mails the authors about claims that held and now fail. Started after the collaboration service
// and the checks.
import { isNull } from 'drizzle-orm';
import { getDb, schema } from '../../db/client';
import { checksService } from '../checks/access';
import { collab, type DocumentChange } from '../collab/access';
import { ConfigError } from '../config';
import type { Service } from '../extensions';
import { registerReview } from './access';
import { StepAuthorLog } from './authors';
import { FailingClaimMailer } from './failingMail';
import { verifySignOffs, type ChangeAuthors } from './signOffs';

export interface ReviewSettings {
  /** How long claims that turned failing wait for others before their mail leaves (ms). */
  failingMailWindowMs: number;
  /** How often who-wrote-which-step is written (ms). */
  stepAuthorsFlushMs: number;
  /** Edits of a derivation within this long are compared with its sign-offs together (ms). */
  signOffCheckDelayMs: number;
}

export const defaultReviewSettings: ReviewSettings = { failingMailWindowMs: 180_000, stepAuthorsFlushMs: 2_000, signOffCheckDelayMs: 250 };

const variables: Record<keyof ReviewSettings, string> = {
  failingMailWindowMs: 'MARGINALIA_FAILING_MAIL_WINDOW_MS',
  stepAuthorsFlushMs: 'MARGINALIA_STEP_AUTHORS_MS',
  signOffCheckDelayMs: 'MARGINALIA_SIGNOFF_CHECK_MS',
};

export function readReviewSettings(env: Record<string, string | undefined>): ReviewSettings {
  const settings = { ...defaultReviewSettings };
  for (const key of Object.keys(variables) as (keyof ReviewSettings)[]) {
    const raw = env[variables[key]];
    if (raw === undefined || raw === '') continue;
    const value = Number(raw);
    if (!Number.isInteger(value) || value < 0) throw new ConfigError(`${variables[key]} must be a whole number of milliseconds (0 or more), not "${raw}".`);
    settings[key] = value;
  }
  if (settings.stepAuthorsFlushMs < 1) throw new ConfigError(`${variables.stepAuthorsFlushMs} must be at least 1.`);
  return settings;
}

/** Compares sign-offs with the working copy after edits, one derivation at a time, edits coalesced. */
class SignOffWatcher {
  private readonly pending = new Map<string, { userIds: Set<string>; edits: Map<string, Set<string>> }>();
  private timer: NodeJS.Timeout | null = null;
  private running: Promise<void> = Promise.resolve();
  private stopped = false;

  constructor(private readonly delayMs: number) {}

  note(change: Pick<DocumentChange, 'derivationId' | 'userIds' | 'edits'>): void {
    if (this.stopped) return;
    let entry = this.pending.get(change.derivationId);
    if (!entry) this.pending.set(change.derivationId, (entry = { userIds: new Set(), edits: new Map() }));
    for (const id of change.userIds) entry.userIds.add(id);
    for (const edit of change.edits) {
      let steps = entry.edits.get(edit.userId);
      if (!steps) entry.edits.set(edit.userId, (steps = new Set()));
      for (const stepId of edit.stepIds) steps.add(stepId);
    }
    this.timer ??= setTimeout(() => {
      this.timer = null;
      void this.drain();
    }, this.delayMs);
    this.timer.unref();
  }

  /** Runs what is pending now; resolves when done. */
  drain(): Promise<void> {
    this.running = this.running.then(async () => {
      const batch = [...this.pending];
      this.pending.clear();
      for (const [derivationId, entry] of batch) {
        if (this.stopped) return;
        const change: ChangeAuthors = {
          userIds: [...entry.userIds],
          edits: [...entry.edits].map(([userId, steps]) => ({ userId, stepIds: [...steps] })),
        };
        try {
          await verifySignOffs(derivationId, change);
        } catch (error) {
          console.error(`review: comparing the sign-offs of derivation ${derivationId} with its text failed:`, error);
        }
      }
    });
    return this.running;
  }

  async stop(): Promise<void> {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    await this.drain();
    this.stopped = true;
  }
}

let running: { authors: StepAuthorLog; watcher: SignOffWatcher; mailer: FailingClaimMailer; unsubscribe: (() => void)[] } | null = null;

export const reviewBackgroundService: Service = {
  name: 'review',
  async start(context) {
    const settings = readReviewSettings(process.env);
    const authors = new StepAuthorLog(settings.stepAuthorsFlushMs);
    const watcher = new SignOffWatcher(settings.signOffCheckDelayMs);
    const mailer = new FailingClaimMailer(settings.failingMailWindowMs, context.origin);
    const unsubscribe = [
      collab().onDocumentChanged((change) => {
        authors.note(change);
        watcher.note(change);
      }),
    ];
    const checks = checksService();
    if (checks) {
      unsubscribe.push(
        checks.onVerdictsChanged((event) => {
          mailer.note(event).catch((error: unknown) => console.error('review: noting claims that turned failing failed:', error));
        }),
      );
    }
    authors.start();
    await mailer.start();
    running = { authors, watcher, mailer, unsubscribe };
    registerReview({ flushStepAuthors: () => authors.flush(), sendFailingMailNow: (id) => mailer.sendNow(id) });

    // Edits stored while no one compared (a crash between commit and comparison) are caught here.
    const signed = await getDb()
      .selectDistinct({ derivationId: schema.signOffs.derivationId })
      .from(schema.signOffs)
      .where(isNull(schema.signOffs.clearedAt));
    for (const { derivationId } of signed) watcher.note({ derivationId, userIds: [], edits: [] });
  },
  async stop() {
    const stopping = running;
    running = null;
    registerReview(undefined);
    if (!stopping) return;
    for (const unsubscribe of stopping.unsubscribe) unsubscribe();
    stopping.mailer.stop();
    await stopping.watcher.stop();
    await stopping.authors.stop();
  },
};
