import { createHash } from 'node:crypto';
import type { Readable } from 'node:stream';
import type { UploadListQuery, UploadListResponse, UploadMeta, UploadResponse } from '../../shared/api/uploads.js';
import { isEngineError } from '../../shared/errors.js';
import { sniffRecordingBytes } from '../../shared/recording/sniff.js';
import type { Db } from '../db/client.js';
import * as repo from '../db/repositories/uploads.js';
import { findRole, listMemberships } from '../db/repositories/workspaces.js';
import { AppError, notFound } from '../errors.js';
import { assertWorkspace, workspaceAllowsAction } from './policy.js';
import { recordingFactsOf } from './recording-facts.js';

export interface IncomingFile {
  fileName: string;
  bytes: Uint8Array;
}

/**
 * Checks every file by content (FIT header, length and CRC; CSV as UTF-8 text) before
 * storing any, so one bad file in a batch stores nothing. Same bytes -> same id.
 * With `readDamaged` (the person's explicit choice), a FIT file whose checksum fails or that
 * is cut short is stored with the damage as a warning instead of refused.
 */
export async function storeUploads(db: Db, userId: string, workspaceId: string | undefined, files: IncomingFile[], options: { readDamaged?: boolean } = {}): Promise<UploadResponse> {
  if (files.length === 0) throw new AppError(400, 'no_file', 'Attach at least one file in the multipart field "file".');
  const target = await targetWorkspace(db, userId, workspaceId);
  const checked = files.map((file) => {
    try {
      return { file, sniff: sniffRecordingBytes(file.bytes, file.fileName, { readDamaged: options.readDamaged === true }) };
    } catch (error) {
      if (isEngineError(error)) throw new AppError(415, 'unsupported_file', error.message, { file: file.fileName, reason: error.code, where: error.where });
      throw error;
    }
  });
  const uploads: UploadResponse['uploads'] = [];
  for (const { file, sniff } of checked) {
    const { record, duplicate } = await repo.storeUpload(db, {
      sha256: createHash('sha256').update(file.bytes).digest('hex'),
      fileName: file.fileName,
      format: sniff.format,
      bytes: file.bytes,
      warnings: sniff.warnings.map((w) => ({ code: w.code, message: w.message })),
      uploadedBy: userId,
      workspaceId: target,
    });
    uploads.push({ ...toMeta(record), duplicate });
  }
  return { uploads };
}

export async function getUploadMeta(db: Db, userId: string, uploadId: string): Promise<UploadMeta> {
  const record = await repo.findUpload(db, uploadId);
  if (!record || !(await repo.userCanSeeUpload(db, uploadId, userId))) throw notFound('Upload');
  return toMeta(record);
}

export async function getUploadContent(db: Db, userId: string, uploadId: string): Promise<{ meta: UploadMeta; bytes: Uint8Array }> {
  const meta = await getUploadMeta(db, userId, uploadId);
  const bytes = await repo.readUploadBytes(db, uploadId);
  if (!bytes) throw notFound('Upload');
  return { meta, bytes };
}

/** Like {@link getUploadContent}, streamed from wherever the bytes live. */
export async function openUploadContent(db: Db, userId: string, uploadId: string): Promise<{ meta: UploadMeta; stream: Readable }> {
  const meta = await getUploadMeta(db, userId, uploadId);
  const stream = await repo.openUploadBytes(db, uploadId);
  if (!stream) throw notFound('Upload');
  return { meta, stream };
}

/** A page of the workspace's earlier uploads, newest first; members only (others 404). */
export async function listUploads(db: Db, userId: string, query: UploadListQuery): Promise<UploadListResponse> {
  assertWorkspace(await findRole(db, query.workspace, userId), 'read');
  const { rows, total } = await repo.listWorkspaceUploads(db, query.workspace, query);
  const uploads: UploadListResponse['uploads'] = [];
  for (const r of rows) {
    const facts = await recordingFactsOf(db, r);
    uploads.push({
      id: r.id,
      fileName: r.fileName,
      size: r.size,
      format: r.format,
      device: facts.device,
      startedAt: facts.startedAt,
      uploadedAt: r.linkedAt.toISOString(),
      uploadedBy: r.linkedBy,
    });
  }
  return { uploads, total, offset: query.offset, limit: query.limit };
}

/** The named workspace (caller must be admin/analyst there), else their first such workspace. */
async function targetWorkspace(db: Db, userId: string, workspaceId: string | undefined): Promise<string> {
  if (workspaceId) {
    assertWorkspace(await findRole(db, workspaceId, userId), 'create');
    return workspaceId;
  }
  const usable = (await listMemberships(db, userId)).find((m) => workspaceAllowsAction(m.role, 'create'));
  if (!usable) throw new AppError(403, 'forbidden', 'You have no workspace where you may add files.');
  return usable.id;
}

function toMeta(r: repo.UploadRecord): UploadMeta {
  return {
    id: r.id,
    sha256: r.sha256,
    fileName: r.fileName,
    size: r.size,
    format: r.format,
    workspaceId: r.workspaceId,
    uploadedBy: r.uploadedBy,
    warnings: r.warnings,
    createdAt: r.createdAt.toISOString(),
  };
}
