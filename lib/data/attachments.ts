import { MAX_FILE_BYTES, PROJECT_FILE_LIMITS } from "@/lib/uploads/config";
import { sqlDateTime } from "@/lib/time";
import type { Actor } from "./actor";
import { audit } from "./audit";
import type { Db } from "./db";
import { conflict, forbidden, HttpError } from "./errors";

export type ProjectFilePurpose = "sketch" | "photo";

export interface StoredFile {
  key: string;
  name: string;
  /** The stored file's real size, measured by the caller from its bytes. */
  sizeBytes: number;
  mimeType: string;
  /** The thumbnail the pages show, for images (re-encoded on ingest). */
  thumbnailKey?: string | null;
  widthPx?: number | null;
  heightPx?: number | null;
}

function fileColumns(file: StoredFile) {
  return {
    file_key: file.key,
    file_name: file.name.slice(0, 255),
    mime_type: file.mimeType,
    size_bytes: file.sizeBytes,
    thumbnail_key: file.thumbnailKey ?? null,
    width_px: file.widthPx ?? null,
    height_px: file.heightPx ?? null,
  };
}

const tooLarge = (bytes: number) =>
  new HttpError(413, `Files can be at most ${Math.round(bytes / 1024 / 1024)} MB.`);

function limitMessage(purpose: ProjectFilePurpose) {
  return `A project can have at most ${PROJECT_FILE_LIMITS[purpose]} ${purpose === "photo" ? "photos" : "sketches"}: delete one first.`;
}

/** Before an upload starts: only the credential's own reviewer may attach evidence to it. */
export async function checkCredentialUpload(
  db: Db,
  actor: Actor,
  credentialId: number,
): Promise<void> {
  if (actor.role !== "reviewer") throw forbidden("Only reviewers upload credential evidence.");
  const credential = await db("credentials").where({ id: credentialId }).first("reviewer_id");
  if (!credential || Number(credential.reviewer_id) !== actor.id)
    throw forbidden("That credential is not yours.");
}

/**
 * Record credential evidence once the file is stored. New evidence replaces the old (which is
 * marked deleted) and sends a rejected credential back to the queue.
 */
export async function recordCredentialEvidence(
  db: Db,
  actor: Actor,
  credentialId: number,
  file: StoredFile,
): Promise<number> {
  if (file.sizeBytes > MAX_FILE_BYTES.credentialEvidence)
    throw tooLarge(MAX_FILE_BYTES.credentialEvidence);
  return db.transaction(async (trx) => {
    const old = await trx("credentials")
      .where({ id: credentialId, reviewer_id: actor.id })
      .forUpdate()
      .first("evidence_attachment_id", "status");
    if (!old) throw forbidden("That credential is not yours.");
    const [id] = await trx("attachments").insert({
      owner_id: actor.id,
      purpose: "credential_evidence",
      ...fileColumns(file),
    });
    await trx("credentials")
      .where({ id: credentialId })
      .update({
        evidence_attachment_id: id,
        ...(old.status === "rejected" ? { status: "pending", admin_reason: null } : {}),
      });
    if (old.evidence_attachment_id)
      await trx("attachments")
        .where({ id: old.evidence_attachment_id })
        .update({ deleted_at: sqlDateTime() });
    await audit(trx, actor.id, "credential.evidence_uploaded", "reviewer", actor.id, {
      credentialId,
      attachmentId: Number(id),
    });
    return Number(id);
  });
}

/** Before an upload starts: the project is the homeowner's own and has room for one more. */
export async function checkProjectUpload(
  db: Db,
  actor: Actor,
  projectId: number,
  purpose: ProjectFilePurpose,
): Promise<void> {
  if (actor.role !== "homeowner") throw forbidden("Only the project's owner can add files to it.");
  const project = await db("projects")
    .where({ id: projectId })
    .whereNull("deleted_at")
    .first("owner_id");
  if (!project || Number(project.owner_id) !== actor.id)
    throw forbidden("That project is not yours.");
  if ((await countLive(db, projectId, purpose)) >= PROJECT_FILE_LIMITS[purpose])
    throw conflict(limitMessage(purpose));
}

async function countLive(db: Db, projectId: number, purpose: ProjectFilePurpose) {
  const [{ n }] = (await db("attachments")
    .where({ project_id: projectId, purpose })
    .whereNull("deleted_at")
    .count({ n: "*" })) as [{ n: number }];
  return Number(n);
}

/**
 * Record a project's sketch or photo once it is stored. The count and the size are checked
 * again here, with the project row locked, against the stored bytes: parallel uploads that each
 * passed the check at the start cannot add up past the limit.
 */
export async function recordProjectFile(
  db: Db,
  actor: Actor,
  projectId: number,
  purpose: ProjectFilePurpose,
  file: StoredFile,
  meta: { caption: string | null; tag: string | null },
): Promise<number> {
  if (file.sizeBytes > MAX_FILE_BYTES[purpose]) throw tooLarge(MAX_FILE_BYTES[purpose]);
  return db.transaction(async (trx) => {
    const project = await trx("projects")
      .where({ id: projectId, owner_id: actor.id })
      .whereNull("deleted_at")
      .forUpdate()
      .first("id");
    if (!project) throw forbidden("That project is not yours.");
    if ((await countLive(trx, projectId, purpose)) >= PROJECT_FILE_LIMITS[purpose])
      throw conflict(limitMessage(purpose));
    const [id] = await trx("attachments").insert({
      owner_id: actor.id,
      project_id: projectId,
      purpose,
      ...fileColumns(file),
      caption: meta.caption,
      tag: meta.tag,
    });
    await audit(trx, actor.id, "file.added", "attachment", Number(id), { projectId, purpose });
    return Number(id);
  });
}
