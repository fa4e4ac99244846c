import { sql } from 'drizzle-orm';
import {
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
} from 'drizzle-orm/pg-core';

// Accounts: the four tables better-auth's drizzle adapter expects (property names are
// better-auth's field names; SQL columns are snake_case).

export const user = pgTable('user', {
  id: text('id').primaryKey(),
  name: text('name').notNull(),
  email: text('email').notNull().unique(),
  emailVerified: boolean('email_verified').notNull().default(false),
  image: text('image'),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
});

export const session = pgTable(
  'session',
  {
    id: text('id').primaryKey(),
    expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
    token: text('token').notNull().unique(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
    ipAddress: text('ip_address'),
    userAgent: text('user_agent'),
    userId: text('user_id')
      .notNull()
      .references(() => user.id, { onDelete: 'cascade' }),
  },
  (t) => [index('session_user_id_idx').on(t.userId)],
);

export const account = pgTable(
  'account',
  {
    id: text('id').primaryKey(),
    accountId: text('account_id').notNull(),
    providerId: text('provider_id').notNull(),
    userId: text('user_id')
      .notNull()
      .references(() => user.id, { onDelete: 'cascade' }),
    accessToken: text('access_token'),
    refreshToken: text('refresh_token'),
    idToken: text('id_token'),
    accessTokenExpiresAt: timestamp('access_token_expires_at', { withTimezone: true }),
    refreshTokenExpiresAt: timestamp('refresh_token_expires_at', { withTimezone: true }),
    scope: text('scope'),
    password: text('password'),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('account_user_id_idx').on(t.userId)],
);

export const verification = pgTable(
  'verification',
  {
    id: text('id').primaryKey(),
    identifier: text('identifier').notNull(),
    value: text('value').notNull(),
    expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
    createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('verification_identifier_idx').on(t.identifier)],
);

// The app's own tables.

export const workspaceRole = pgEnum('workspace_role', ['admin', 'analyst', 'viewer']);
export const notebookRole = pgEnum('notebook_role', ['owner', 'editor', 'viewer']);
export const recordingFormat = pgEnum('recording_format', ['fit', 'csv']);

const newId = () => crypto.randomUUID();
const createdAt = () => timestamp('created_at', { withTimezone: true }).notNull().defaultNow();

export const workspace = pgTable('workspace', {
  id: text('id').primaryKey().$defaultFn(newId),
  name: text('name').notNull(),
  /** The workspace made for a user at sign-up. */
  personal: boolean('personal').notNull().default(false),
  createdBy: text('created_by').references(() => user.id, { onDelete: 'set null' }),
  createdAt: createdAt(),
});

export const workspaceMember = pgTable(
  'workspace_member',
  {
    workspaceId: text('workspace_id')
      .notNull()
      .references(() => workspace.id, { onDelete: 'cascade' }),
    userId: text('user_id')
      .notNull()
      .references(() => user.id, { onDelete: 'cascade' }),
    role: workspaceRole('role').notNull(),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.workspaceId, t.userId] }), index('workspace_member_user_idx').on(t.userId)],
);

/**
 * An e-mailed invitation to join a workspace. Only the SHA-256 of the token is kept, so a
 * database read does not yield working links. Revoking deletes the row; accepting stamps
 * accepted_at, after which the link no longer opens.
 */
export const workspaceInvitation = pgTable(
  'workspace_invitation',
  {
    id: text('id').primaryKey().$defaultFn(newId),
    workspaceId: text('workspace_id')
      .notNull()
      .references(() => workspace.id, { onDelete: 'cascade' }),
    /** Lower-cased: the accepting account's e-mail must match it. */
    email: text('email').notNull(),
    role: workspaceRole('role').notNull(),
    tokenHash: text('token_hash').notNull().unique(),
    invitedBy: text('invited_by').references(() => user.id, { onDelete: 'set null' }),
    expiresAt: timestamp('expires_at', { withTimezone: true }).notNull(),
    acceptedAt: timestamp('accepted_at', { withTimezone: true }),
    acceptedBy: text('accepted_by').references(() => user.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [index('workspace_invitation_workspace_idx').on(t.workspaceId, t.email)],
);

export const notebook = pgTable(
  'notebook',
  {
    id: text('id').primaryKey().$defaultFn(newId),
    workspaceId: text('workspace_id')
      .notNull()
      .references(() => workspace.id, { onDelete: 'cascade' }),
    ownerId: text('owner_id')
      .notNull()
      .references(() => user.id),
    title: text('title').notNull(),
    currentRevision: integer('current_revision').notNull().default(1),
    forkedFromNotebookId: text('forked_from_notebook_id'),
    forkedFromRevision: integer('forked_from_revision'),
    createdAt: createdAt(),
    updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
  },
  (t) => [index('notebook_workspace_idx').on(t.workspaceId)],
);

export const notebookRevision = pgTable(
  'notebook_revision',
  {
    notebookId: text('notebook_id')
      .notNull()
      .references(() => notebook.id, { onDelete: 'cascade' }),
    revision: integer('revision').notNull(),
    document: jsonb('document').notNull(),
    authorId: text('author_id').references(() => user.id, { onDelete: 'set null' }),
    summary: text('summary').notNull().default(''),
    createdAt: createdAt(),
  },
  // The primary key is the unique (notebook_id, revision) that makes a concurrent save of the same number fail.
  (t) => [primaryKey({ columns: [t.notebookId, t.revision] })],
);

export const notebookAccess = pgTable(
  'notebook_access',
  {
    notebookId: text('notebook_id')
      .notNull()
      .references(() => notebook.id, { onDelete: 'cascade' }),
    userId: text('user_id')
      .notNull()
      .references(() => user.id, { onDelete: 'cascade' }),
    role: notebookRole('role').notNull(),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.notebookId, t.userId] }), index('notebook_access_user_idx').on(t.userId)],
);

/** bytea: PGlite returns Uint8Array, node-postgres a Buffer; both come out as a plain Uint8Array. */
const bytea = customType<{ data: Uint8Array; driverData: Uint8Array }>({
  dataType: () => 'bytea',
  toDriver: (value) => (Buffer.isBuffer(value) ? value : Buffer.from(value.buffer, value.byteOffset, value.byteLength)),
  fromDriver: (value) => new Uint8Array(value.buffer, value.byteOffset, value.byteLength),
});

export const upload = pgTable('upload', {
  id: text('id').primaryKey().$defaultFn(newId),
  sha256: text('sha256').notNull().unique(),
  fileName: text('file_name').notNull(),
  size: integer('size').notNull(),
  format: recordingFormat('format').notNull(),
  /** The original file; null when it lives in the object store under its sha256 (server/storage/). */
  bytes: bytea('bytes'),
  warnings: jsonb('warnings').notNull().default(sql`'[]'::jsonb`),
  uploadedBy: text('uploaded_by').references(() => user.id, { onDelete: 'set null' }),
  /** Workspace of the first upload; later uploads of the same bytes add an upload_link. */
  workspaceId: text('workspace_id')
    .notNull()
    .references(() => workspace.id, { onDelete: 'cascade' }),
  createdAt: createdAt(),
});

/**
 * Every workspace that uploaded the same bytes. The bytes are stored once; whoever
 * uploads them again (in another workspace) gets the same id and may see it.
 */
export const uploadLink = pgTable(
  'upload_link',
  {
    uploadId: text('upload_id')
      .notNull()
      .references(() => upload.id, { onDelete: 'cascade' }),
    workspaceId: text('workspace_id')
      .notNull()
      .references(() => workspace.id, { onDelete: 'cascade' }),
    uploadedBy: text('uploaded_by').references(() => user.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [primaryKey({ columns: [t.uploadId, t.workspaceId] })],
);

/** Mail captured by the built-in SMTP catcher (local installs without SMTP_URL). */
export const mailMessage = pgTable('mail_message', {
  id: text('id').primaryKey().$defaultFn(newId),
  to: text('to').notNull(),
  from: text('from').notNull(),
  subject: text('subject').notNull(),
  text: text('text').notNull(),
  html: text('html'),
  createdAt: createdAt(),
});

/**
 * A recipe run: one notebook revision computed on the server on chosen uploads.
 * `snapshot` holds the reduced outputs (shared/api/snapshots.ts), never raw samples.
 */
export const notebookRun = pgTable(
  'notebook_run',
  {
    id: text('id').primaryKey().$defaultFn(newId),
    notebookId: text('notebook_id')
      .notNull()
      .references(() => notebook.id, { onDelete: 'cascade' }),
    revision: integer('revision').notNull(),
    /** [{ slot, uploadId, fileName }] in slot order. */
    bindings: jsonb('bindings').notNull(),
    label: text('label'),
    snapshot: jsonb('snapshot').notNull(),
    cellCount: integer('cell_count').notNull(),
    failedCells: integer('failed_cells').notNull(),
    durationMs: integer('duration_ms').notNull(),
    createdBy: text('created_by').references(() => user.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [index('notebook_run_notebook_idx').on(t.notebookId, t.createdAt)],
);

/** A read-only link to a notebook. Revoking deletes the row, so the token stops working at once. */
export const shareLink = pgTable(
  'share_link',
  {
    token: text('token').primaryKey(),
    notebookId: text('notebook_id')
      .notNull()
      .references(() => notebook.id, { onDelete: 'cascade' }),
    /** Only signed-in members of the notebook's workspace (or grant holders) may open it. */
    membersOnly: boolean('members_only').notNull().default(false),
    createdBy: text('created_by').references(() => user.id, { onDelete: 'set null' }),
    createdAt: createdAt(),
  },
  (t) => [index('share_link_notebook_idx').on(t.notebookId)],
);

/** A notebook published for signed-out readers: at most one per notebook, replaced on republish. */
export const publication = pgTable('publication', {
  notebookId: text('notebook_id')
    .primaryKey()
    .references(() => notebook.id, { onDelete: 'cascade' }),
  slug: text('slug').notNull().unique(),
  revision: integer('revision').notNull(),
  snapshot: jsonb('snapshot').notNull(),
  allowDownloads: boolean('allow_downloads').notNull().default(false),
  publishedBy: text('published_by').references(() => user.id, { onDelete: 'set null' }),
  publishedAt: timestamp('published_at', { withTimezone: true }).notNull().defaultNow(),
});
