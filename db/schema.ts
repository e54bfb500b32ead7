// The database schema. Change it here, then `npm run db:generate` writes a migration into
// db/migrations, which the server applies at start-up.
import { sql } from 'drizzle-orm';
import {
  bigint,
  bigserial,
  boolean,
  customType,
  index,
  integer,
  jsonb,
  pgEnum,
  pgTable,
  primaryKey,
  text,
  timestamp,
  uniqueIndex,
  uuid,
} from 'drizzle-orm/pg-core';

export const memberRoles = ['lead', 'author', 'reviewer', 'reader'] as const;
export type MemberRole = (typeof memberRoles)[number];
export const memberRole = pgEnum('member_role', memberRoles);

const createdAt = () => timestamp('created_at', { withTimezone: true }).notNull().defaultNow();

/** A person with an account. E-mail is stored lower-cased; a user who only ever signed in by link has no password. */
export const users = pgTable('users', {
  id: uuid('id').primaryKey().defaultRandom(),
  email: text('email').notNull().unique(),
  name: text('name').notNull(),
  passwordHash: text('password_hash'),
  emailVerified: timestamp('email_verified', { withTimezone: true }),
  createdAt: createdAt(),
});

/** One-time sign-in links (the token is stored hashed, as the sign-in library hands it over). */
export const signInTokens = pgTable(
  'sign_in_tokens',
  {
    identifier: text('identifier').notNull(),
    tokenHash: text('token_hash').notNull(),
    expires: timestamp('expires', { withTimezone: true }).notNull(),
  },
  (t) => [primaryKey({ columns: [t.identifier, t.tokenHash] })],
);

export const groups = pgTable('groups', {
  id: uuid('id').primaryKey().defaultRandom(),
  name: text('name').notNull(),
  description: text('description').notNull().default(''),
  createdBy: uuid('created_by').references(() => users.id, { onDelete: 'set null' }),
  createdAt: createdAt(),
});

export const memberships = pgTable(
  'memberships',
  {
    groupId: uuid('group_id').notNull().references(() => groups.id, { onDelete: 'cascade' }),
    userId: uuid('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
    role: memberRole('role').notNull(),
    joinedAt: timestamp('joined_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.groupId, t.userId] }), index('memberships_user_idx').on(t.userId)],
);

/** An invitation by e-mail; the link's token is kept only as a SHA-256 hash. */
export const invitations = pgTable(
  'invitations',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    groupId: uuid('group_id').notNull().references(() => groups.id, { onDelete: 'cascade' }),
    email: text('email').notNull(),
    role: memberRole('role').notNull(),
    tokenHash: text('token_hash').notNull(),
    invitedBy: uuid('invited_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
    expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
    acceptedAt: timestamp('accepted_at', { withTimezone: true }),
    acceptedBy: uuid('accepted_by').references(() => users.id, { onDelete: 'set null' }),
    revokedAt: timestamp('revoked_at', { withTimezone: true }),
  },
  (t) => [uniqueIndex('invitations_token_idx').on(t.tokenHash), index('invitations_group_idx').on(t.groupId)],
);

/**
 * A derivation of a group. The claim counts are written by check runs (live summaries and the
 * lock); lockedVersionCount is kept by the lock in the same transaction that stores a locked version.
 * Deleting only marks the row, so nothing written is lost.
 */
export const derivations = pgTable(
  'derivations',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    groupId: uuid('group_id').notNull().references(() => groups.id, { onDelete: 'cascade' }),
    title: text('title').notNull(),
    createdBy: uuid('created_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
    updatedBy: uuid('updated_by').references(() => users.id, { onDelete: 'set null' }),
    deletedAt: timestamp('deleted_at', { withTimezone: true }),
    claimsHolding: integer('claims_holding').notNull().default(0),
    claimsFailing: integer('claims_failing').notNull().default(0),
    claimsCheckedAt: timestamp('claims_checked_at', { withTimezone: true }),
    lockedVersionCount: integer('locked_version_count').notNull().default(0),
  },
  (t) => [index('derivations_group_idx').on(t.groupId).where(sql`${t.deletedAt} is null`)],
);

export const derivationAuthors = pgTable(
  'derivation_authors',
  {
    derivationId: uuid('derivation_id').notNull().references(() => derivations.id, { onDelete: 'cascade' }),
    userId: uuid('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
    addedAt: timestamp('added_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.derivationId, t.userId] })],
);

/** Every message the local mail sink received (only used while no SMTP_URL is configured). */
export const mailMessages = pgTable(
  'mail_messages',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    receivedAt: timestamp('received_at', { withTimezone: true }).notNull().defaultNow(),
    sender: text('sender').notNull(),
    recipients: text('recipients').array().notNull(),
    subject: text('subject').notNull(),
    text: text('text').notNull(),
    html: text('html'),
  },
  (t) => [index('mail_messages_received_idx').on(t.receivedAt)],
);

// ---- datasets: numbers brought in beside the flow (CSV or TSV uploads) -------------------------

export const datasetFormats = ['csv', 'tsv'] as const;
export type DatasetFormat = (typeof datasetFormats)[number];
export const datasetFormat = pgEnum('dataset_format', datasetFormats);

/** What a column means for plots and fits: the abscissa, the ordinate, the ordinate's error bar, or kept as is. */
export const columnRoles = ['x', 'y', 'sigma', 'other'] as const;
export type ColumnRole = (typeof columnRoles)[number];
export const columnRole = pgEnum('column_role', columnRoles);

/**
 * An uploaded dataset of a group: the original file (validated UTF-8 text) and who brought it in.
 * Its parsed columns live in dataset_columns, written in the same transaction.
 */
export const datasets = pgTable(
  'datasets',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    groupId: uuid('group_id').notNull().references(() => groups.id, { onDelete: 'cascade' }),
    name: text('name').notNull(),
    description: text('description').notNull().default(''),
    fileName: text('file_name').notNull(),
    format: datasetFormat('format').notNull(),
    fileText: text('file_text').notNull(),
    fileBytes: integer('file_bytes').notNull(),
    fileSha256: text('file_sha256').notNull(),
    rowCount: integer('row_count').notNull(),
    uploadedBy: uuid('uploaded_by').references(() => users.id, { onDelete: 'set null' }),
    uploadedAt: timestamp('uploaded_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [
    index('datasets_group_idx').on(t.groupId, t.uploadedAt),
    uniqueIndex('datasets_group_name_idx').on(t.groupId, sql`lower(${t.name})`),
  ],
);

/** One parsed column of a dataset, in file order; numeric columns hold numbers, others the cell text. */
export const datasetColumns = pgTable(
  'dataset_columns',
  {
    datasetId: uuid('dataset_id').notNull().references(() => datasets.id, { onDelete: 'cascade' }),
    position: integer('position').notNull(),
    header: text('header').notNull(),
    role: columnRole('role').notNull(),
    quantity: text('quantity').notNull().default(''),
    unit: text('unit').notNull().default(''),
    numeric: boolean('numeric').notNull(),
    values: jsonb('values').$type<(number | string | null)[]>().notNull(),
  },
  (t) => [primaryKey({ columns: [t.datasetId, t.position] })],
);

// ---- collaboration: the working copy of each derivation, as Yjs updates -----------------------

/** Raw bytes (PostgreSQL bytea); PGlite hands them over as a Uint8Array. */
const bytes = customType<{ data: Uint8Array; driverData: Uint8Array }>({ dataType: () => 'bytea' });

/**
 * The append-only log of accepted document updates (Yjs update encoding), one row per update, in
 * the order the server accepted them. Rows covered by the derivation's snapshot are removed when
 * the snapshot is written, in the same transaction.
 */
export const documentUpdates = pgTable(
  'document_updates',
  {
    seq: bigserial('seq', { mode: 'number' }).primaryKey(),
    derivationId: uuid('derivation_id').notNull().references(() => derivations.id, { onDelete: 'cascade' }),
    update: bytes('update').notNull(),
    /** Who made it; null for updates made by the server itself (imports). */
    userId: uuid('user_id').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [index('document_updates_derivation_idx').on(t.derivationId, t.seq)],
);

/** The compacted state of a derivation's document (Y.encodeStateAsUpdate), covering every update up to upToSeq. */
export const documentSnapshots = pgTable('document_snapshots', {
  derivationId: uuid('derivation_id').primaryKey().references(() => derivations.id, { onDelete: 'cascade' }),
  upToSeq: bigint('up_to_seq', { mode: 'number' }).notNull(),
  state: bytes('state').notNull(),
  createdAt: createdAt(),
});

// ---- checks: the server's latest verdict on every claim of a derivation's working copy ---------

export const checkStatuses = ['holds', 'fails', 'inconclusive', 'invalid'] as const;
export type CheckStatus = (typeof checkStatuses)[number];
export const checkStatus = pgEnum('check_status', checkStatuses);

/**
 * The latest server-side check of each claim block (by its stepId) of a derivation's working
 * copy, written by the background re-check after edits. `inputHash` identifies what was checked
 * (the claim and its flow), so an unchanged claim is not checked again; `previousStatus` and
 * `statusSince` record the last change of verdict. Rows of claims no longer in the document are
 * removed by the run that no longer finds them; the derivation's claim counts are written in the
 * same transaction.
 */
export const claimChecks = pgTable(
  'claim_checks',
  {
    derivationId: uuid('derivation_id').notNull().references(() => derivations.id, { onDelete: 'cascade' }),
    stepId: text('step_id').notNull(),
    /** The claim's id in the claim file (its name, or one made from its step). */
    claimId: text('claim_id').notNull(),
    kind: text('kind').notNull(),
    /** Its place among the document's claim blocks (0 for the first), as of the last run. */
    position: integer('position').notNull().default(0),
    /** The flow block it was checked against; null for claims without a flow. */
    flowStepId: text('flow_step_id'),
    status: checkStatus('status').notNull(),
    previousStatus: checkStatus('previous_status'),
    statusSince: timestamp('status_since', { withTimezone: true }).notNull().defaultNow(),
    inputHash: text('input_hash').notNull(),
    /** The solver's whole result (flow/ ClaimResult): measured value, evidence, settings, time. */
    result: jsonb('result').notNull(),
    checkedAt: timestamp('checked_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.derivationId, t.stepId] })],
);

// ---- review: remarks anchored to steps, sign-offs, who wrote each step, claims turned failing --

/**
 * A remark thread anchored to a step (by stepId) of a derivation's working copy. The anchor is a
 * step id, not a position, so edits elsewhere never move it; a thread whose step was removed stays
 * (shown "on a removed step" with the excerpt kept from when it was started).
 */
export const remarkThreads = pgTable(
  'remark_threads',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    derivationId: uuid('derivation_id').notNull().references(() => derivations.id, { onDelete: 'cascade' }),
    stepId: text('step_id').notNull(),
    /** The step's text when the thread was started (a short excerpt). */
    stepExcerpt: text('step_excerpt').notNull().default(''),
    createdBy: uuid('created_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
    resolvedAt: timestamp('resolved_at', { withTimezone: true }),
    resolvedBy: uuid('resolved_by').references(() => users.id, { onDelete: 'set null' }),
  },
  (t) => [index('remark_threads_derivation_idx').on(t.derivationId, t.stepId)],
);

/** What happened in a thread, in order: a remark (the first one opens it), or it was resolved or reopened. */
export const remarkEntryKinds = ['remark', 'resolved', 'reopened'] as const;
export type RemarkEntryKind = (typeof remarkEntryKinds)[number];
export const remarkEntryKind = pgEnum('remark_entry_kind', remarkEntryKinds);

/** The entries of a remark thread. Nothing is ever deleted or rewritten. */
export const remarkEntries = pgTable(
  'remark_entries',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    threadId: uuid('thread_id').notNull().references(() => remarkThreads.id, { onDelete: 'cascade' }),
    kind: remarkEntryKind('kind').notNull(),
    authorId: uuid('author_id').references(() => users.id, { onDelete: 'set null' }),
    body: text('body').notNull().default(''),
    createdAt: createdAt(),
  },
  (t) => [index('remark_entries_thread_idx').on(t.threadId, t.createdAt)],
);

/**
 * A reviewer's (or lead's) sign-off of a step. At sign-off the server records a SHA-256 of the
 * step's content and, for a step bound to a flow block (a claim), of that block; a later edit that
 * changes either clears it (clearedAt, with the reason and whose edit). Cleared rows are kept:
 * they are the step's sign-off history. At most one standing sign-off per person and step.
 */
export const signOffs = pgTable(
  'sign_offs',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    derivationId: uuid('derivation_id').notNull().references(() => derivations.id, { onDelete: 'cascade' }),
    stepId: text('step_id').notNull(),
    userId: uuid('user_id').references(() => users.id, { onDelete: 'set null' }),
    signedAt: timestamp('signed_at', { withTimezone: true }).notNull().defaultNow(),
    contentHash: text('content_hash').notNull(),
    /** The flow block the step depends on, and a hash of it; null for a step that depends on none. */
    dependencyStepId: text('dependency_step_id'),
    dependencyHash: text('dependency_hash'),
    clearedAt: timestamp('cleared_at', { withTimezone: true }),
    /** Why it was cleared, in words ("the step was edited", "withdrawn by its signer", ...). */
    clearedReason: text('cleared_reason'),
    /** Whose edit cleared it (or who withdrew it); null when no one person's. */
    clearedBy: uuid('cleared_by').references(() => users.id, { onDelete: 'set null' }),
  },
  (t) => [
    index('sign_offs_derivation_idx').on(t.derivationId, t.stepId),
    uniqueIndex('sign_offs_standing_idx').on(t.derivationId, t.stepId, t.userId).where(sql`${t.clearedAt} is null`),
  ],
);

/** Who wrote each step: every user whose accepted edits touched it (for "a remark on your step"). */
export const stepAuthors = pgTable(
  'step_authors',
  {
    derivationId: uuid('derivation_id').notNull().references(() => derivations.id, { onDelete: 'cascade' }),
    stepId: text('step_id').notNull(),
    userId: uuid('user_id').notNull().references(() => users.id, { onDelete: 'cascade' }),
    firstEditAt: timestamp('first_edit_at', { withTimezone: true }).notNull().defaultNow(),
    lastEditAt: timestamp('last_edit_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [primaryKey({ columns: [t.derivationId, t.stepId, t.userId] })],
);

/**
 * A claim that held and now fails after an edit, waiting to be mailed to the derivation's authors
 * (batched per derivation). Kept in the database so a restart does not lose the mail; mailedAt is
 * set once it was dealt with: mailed, or found holding again before the mail left.
 */
export const claimTurnNotices = pgTable(
  'claim_turn_notices',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    derivationId: uuid('derivation_id').notNull().references(() => derivations.id, { onDelete: 'cascade' }),
    stepId: text('step_id').notNull(),
    claimId: text('claim_id').notNull(),
    kind: text('kind').notNull(),
    message: text('message').notNull().default(''),
    /** The users whose edits led to the run that found it failing. */
    editedBy: uuid('edited_by').array().notNull().default(sql`'{}'::uuid[]`),
    turnedAt: timestamp('turned_at', { withTimezone: true }).notNull().defaultNow(),
    mailedAt: timestamp('mailed_at', { withTimezone: true }),
  },
  (t) => [index('claim_turn_notices_pending_idx').on(t.derivationId).where(sql`${t.mailedAt} is null`)],
);

// ---- versions: named snapshots of a derivation, locked versions and their share links ---------

/**
 * A named version of a derivation: a Yjs snapshot of the whole working copy (every root type,
 * Y.encodeStateAsUpdate) with who saved it, when, the body it holds (ProseMirror JSON read from
 * the snapshot) and the server's verdict on each of its claims at that moment. Numbered 1, 2, ...
 * per derivation.
 *
 * A locked version additionally holds the check report of the lock's own run of every claim
 * (stored as the exact JSON text that was hashed) and the SHA-256 over the snapshot and that
 * report (server/versions/hash.ts defines the bytes). A trigger (migration 0007) refuses any
 * UPDATE or DELETE of a locked row, so a locked version cannot change, whoever asks.
 */
export const derivationVersions = pgTable(
  'derivation_versions',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    derivationId: uuid('derivation_id').notNull().references(() => derivations.id, { onDelete: 'restrict' }),
    number: integer('number').notNull(),
    name: text('name').notNull(),
    createdBy: uuid('created_by').references(() => users.id, { onDelete: 'restrict' }),
    createdAt: createdAt(),
    /** Y.encodeStateAsUpdate of the working copy at the time. */
    state: bytes('state').notNull(),
    /** SHA-256 (hex) of the body's canonical JSON: equal text and blocks give equal hashes. */
    contentSha256: text('content_sha256').notNull(),
    /** The document body read from the state (ProseMirror JSON). */
    body: jsonb('body').notNull(),
    /** Each claim's verdict for this content: { checkedAt, summary, claims: [...] }. */
    checks: jsonb('checks').notNull(),
    lockedAt: timestamp('locked_at', { withTimezone: true }),
    lockedBy: uuid('locked_by').references(() => users.id, { onDelete: 'restrict' }),
    /** The check report of the lock, exactly the JSON text that was hashed. */
    report: text('report'),
    /** SHA-256 (hex) over the snapshot and the report. */
    lockSha256: text('lock_sha256'),
  },
  (t) => [
    uniqueIndex('derivation_versions_number_idx').on(t.derivationId, t.number),
    // The same content is locked once.
    uniqueIndex('derivation_versions_locked_content_idx').on(t.derivationId, t.contentSha256).where(sql`${t.lockedAt} is not null`),
    index('derivation_versions_derivation_idx').on(t.derivationId, t.createdAt),
  ],
);

/**
 * A share link to a locked version: anyone holding the token reads that version, signed in or
 * not. The token (32 random bytes) is kept only as its SHA-256; a link expires and can be revoked.
 */
export const shareLinks = pgTable(
  'share_links',
  {
    id: uuid('id').primaryKey().defaultRandom(),
    versionId: uuid('version_id').notNull().references(() => derivationVersions.id, { onDelete: 'restrict' }),
    tokenHash: text('token_hash').notNull(),
    /** A note for the lead's own list, e.g. who the link was made for. */
    note: text('note').notNull().default(''),
    createdBy: uuid('created_by').references(() => users.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
    expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
    revokedAt: timestamp('revoked_at', { withTimezone: true }),
    revokedBy: uuid('revoked_by').references(() => users.id, { onDelete: 'set null' }),
  },
  (t) => [uniqueIndex('share_links_token_idx').on(t.tokenHash), index('share_links_version_idx').on(t.versionId, t.createdAt)],
);
