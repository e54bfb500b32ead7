// Remarks anchored to steps: threads with replies, resolved and reopened. Every entry is kept
// (nothing is deleted or rewritten); a thread whose step was removed stays, "on a removed step".
// A remark mails the step's authors (and, for a reply, the thread's earlier writers).
import { and, asc, eq, inArray } from 'drizzle-orm';
import { getDb, schema } from '../../db/client';
import type { RemarkEntryKind } from '../../db/schema';
import { badRequest, conflict, notFound } from '../api/errors';
import { sendMail } from '../mail';
import { remarkMail } from '../mailTemplates';
import type { SessionUser } from '../session';
import { reviewService } from './access';
import { stepAuthorIds } from './authors';
import { peopleById, personOf, type PersonRef } from './people';
import { notInDocument, readWorkingSteps } from './signOffs';
import type { StepInfo } from './steps';

type ThreadRow = typeof schema.remarkThreads.$inferSelect;
type EntryRow = typeof schema.remarkEntries.$inferSelect;

export interface RemarkEntryView {
  id: string;
  kind: RemarkEntryKind;
  by: PersonRef;
  body: string;
  at: Date;
}

export interface RemarkThreadView {
  id: string;
  stepId: string;
  /** The step is still in the working copy. */
  stepPresent: boolean;
  /** The step's text now, or as it read when the thread began if it was removed. */
  excerpt: string;
  /** Its place in the document (removed steps: null, listed last). */
  position: number | null;
  startedBy: PersonRef;
  startedAt: Date;
  resolved: { at: Date; by: PersonRef } | null;
  entries: RemarkEntryView[];
}

export async function threadViews(
  derivationId: string,
  steps: ReadonlyMap<string, StepInfo>,
  options: { threadIds?: string[] } = {},
): Promise<RemarkThreadView[]> {
  const db = getDb();
  const conditions = [eq(schema.remarkThreads.derivationId, derivationId)];
  if (options.threadIds) conditions.push(inArray(schema.remarkThreads.id, options.threadIds));
  const threads = await db.select().from(schema.remarkThreads).where(and(...conditions)).orderBy(asc(schema.remarkThreads.createdAt));
  if (threads.length === 0) return [];
  const entries = await db
    .select()
    .from(schema.remarkEntries)
    .where(inArray(schema.remarkEntries.threadId, threads.map((t) => t.id)))
    .orderBy(asc(schema.remarkEntries.createdAt));
  const people = await peopleById([...threads.flatMap((t) => [t.createdBy, t.resolvedBy]), ...entries.map((e) => e.authorId)]);
  const entriesOf = new Map<string, EntryRow[]>();
  for (const entry of entries) {
    const list = entriesOf.get(entry.threadId);
    if (list) list.push(entry);
    else entriesOf.set(entry.threadId, [entry]);
  }
  const views = threads.map((thread) => viewOf(thread, entriesOf.get(thread.id) ?? [], steps.get(thread.stepId), people));
  // Document order; threads on removed steps last, oldest first.
  return views.sort((a, b) => (a.position ?? Infinity) - (b.position ?? Infinity) || a.startedAt.getTime() - b.startedAt.getTime());
}

function viewOf(thread: ThreadRow, entries: EntryRow[], step: StepInfo | undefined, people: ReadonlyMap<string, PersonRef>): RemarkThreadView {
  return {
    id: thread.id,
    stepId: thread.stepId,
    stepPresent: step !== undefined,
    excerpt: step?.excerpt ?? thread.stepExcerpt,
    position: step?.position ?? null,
    startedBy: personOf(people, thread.createdBy),
    startedAt: thread.createdAt,
    resolved: thread.resolvedAt ? { at: thread.resolvedAt, by: personOf(people, thread.resolvedBy) } : null,
    entries: entries.map((entry) => ({ id: entry.id, kind: entry.kind, by: personOf(people, entry.authorId), body: entry.body, at: entry.createdAt })),
  };
}

async function oneThread(derivationId: string, threadId: string, steps?: ReadonlyMap<string, StepInfo>): Promise<RemarkThreadView> {
  const [view] = await threadViews(derivationId, steps ?? (await readWorkingSteps(derivationId)), { threadIds: [threadId] });
  if (!view) throw notFound('No such remark thread in this derivation.');
  return view;
}

async function threadRow(derivationId: string, threadId: string): Promise<ThreadRow> {
  const [row] = await getDb()
    .select()
    .from(schema.remarkThreads)
    .where(and(eq(schema.remarkThreads.id, threadId), eq(schema.remarkThreads.derivationId, derivationId)));
  if (!row) throw notFound('No such remark thread in this derivation.');
  return row;
}

/** Starts a thread on a step of the working copy with its first remark. */
export async function startThread(input: { derivationId: string; user: SessionUser; stepId: string; body: string; origin: string }): Promise<RemarkThreadView> {
  const steps = await readWorkingSteps(input.derivationId);
  const step = steps.get(input.stepId);
  if (!step) throw badRequest(notInDocument, 'stepId');
  const threadId = await getDb().transaction(async (tx) => {
    const [thread] = await tx
      .insert(schema.remarkThreads)
      .values({ derivationId: input.derivationId, stepId: input.stepId, stepExcerpt: step.excerpt, createdBy: input.user.id })
      .returning({ id: schema.remarkThreads.id });
    await tx.insert(schema.remarkEntries).values({ threadId: thread!.id, kind: 'remark', authorId: input.user.id, body: input.body });
    return thread!.id;
  });
  const view = await oneThread(input.derivationId, threadId, steps);
  void mailRemark({ ...input, thread: view, reply: false });
  return view;
}

/** A reply in a thread. A resolved thread is reopened first (its own action). */
export async function replyToThread(input: { derivationId: string; threadId: string; user: SessionUser; body: string; origin: string }): Promise<RemarkThreadView> {
  const thread = await threadRow(input.derivationId, input.threadId);
  if (thread.resolvedAt) throw conflict('This thread is resolved: reopen it to reply.');
  await getDb().insert(schema.remarkEntries).values({ threadId: thread.id, kind: 'remark', authorId: input.user.id, body: input.body });
  const view = await oneThread(input.derivationId, thread.id);
  void mailRemark({ ...input, stepId: thread.stepId, thread: view, reply: true });
  return view;
}

/** Resolves or reopens a thread, recorded as an entry of its own. */
export async function setThreadResolved(input: { derivationId: string; threadId: string; user: SessionUser; resolved: boolean }): Promise<RemarkThreadView> {
  const db = getDb();
  await db.transaction(async (tx) => {
    const [thread] = await tx
      .select()
      .from(schema.remarkThreads)
      .where(and(eq(schema.remarkThreads.id, input.threadId), eq(schema.remarkThreads.derivationId, input.derivationId)))
      .for('update');
    if (!thread) throw notFound('No such remark thread in this derivation.');
    if (input.resolved && thread.resolvedAt) throw conflict('This thread is already resolved.');
    if (!input.resolved && !thread.resolvedAt) throw conflict('This thread is open already.');
    const at = new Date();
    await tx
      .update(schema.remarkThreads)
      .set(input.resolved ? { resolvedAt: at, resolvedBy: input.user.id } : { resolvedAt: null, resolvedBy: null })
      .where(eq(schema.remarkThreads.id, thread.id));
    await tx.insert(schema.remarkEntries).values({ threadId: thread.id, kind: input.resolved ? 'resolved' : 'reopened', authorId: input.user.id, createdAt: at });
  });
  return oneThread(input.derivationId, input.threadId);
}

// ---- mail ------------------------------------------------------------------------------------

async function mailRemark(input: {
  derivationId: string;
  stepId: string;
  user: SessionUser;
  body: string;
  origin: string;
  thread: RemarkThreadView;
  reply: boolean;
}): Promise<void> {
  try {
    await reviewService()?.flushStepAuthors();
    const db = getDb();
    const [derivation] = await db
      .select({ title: schema.derivations.title, groupName: schema.groups.name, groupId: schema.groups.id })
      .from(schema.derivations)
      .innerJoin(schema.groups, eq(schema.groups.id, schema.derivations.groupId))
      .where(eq(schema.derivations.id, input.derivationId));
    if (!derivation) return;
    const writers = new Set(await stepAuthorIds(input.derivationId, input.stepId));
    const participants = new Set(input.thread.entries.map((e) => e.by.id).filter((id): id is string => id !== null));
    const recipients = [...new Set([...writers, ...participants])].filter((id) => id !== input.user.id);
    if (recipients.length === 0) return;
    const members = await db
      .select({ id: schema.users.id, email: schema.users.email })
      .from(schema.users)
      .innerJoin(schema.memberships, and(eq(schema.memberships.userId, schema.users.id), eq(schema.memberships.groupId, derivation.groupId)))
      .where(inArray(schema.users.id, recipients));
    const link = `${input.origin}/derivations/${input.derivationId}?step=${encodeURIComponent(input.stepId)}&thread=${input.thread.id}`;
    for (const member of members) {
      const mail = remarkMail({
        writer: input.user.name,
        derivationTitle: derivation.title,
        groupName: derivation.groupName,
        stepExcerpt: input.thread.excerpt,
        body: input.body,
        reply: input.reply,
        onTheirStep: writers.has(member.id),
        link,
      });
      await sendMail({ to: member.email, ...mail });
    }
  } catch (error) {
    // The remark is stored whatever happens to its mail.
    console.error(`review: mailing a remark on derivation ${input.derivationId} failed:`, error);
  }
}
