import type { Actor } from "./actor";
import type { Db } from "./db";
import { forbidden, notFound } from "./errors";
import { isVerifiedReviewer } from "./reviewers";

export interface AttachmentRow {
  id: number;
  ownerId: number;
  projectId: number | null;
  purpose: "sketch" | "photo" | "credential_evidence";
  fileKey: string;
  /** A small WebP of an image (made on ingest), or null. */
  thumbnailKey: string | null;
  fileName: string;
  mimeType: string;
  sizeBytes: number;
}

/**
 * Who may read a stored file: its owner and admins always; for a project's sketch and photos
 * also verified reviewers while the project has an open request, and the reviewer of a job on
 * it. Credential evidence: only its reviewer and admins. Anyone else: 403.
 */
export async function getReadableAttachment(
  db: Db,
  actor: Actor,
  id: number,
): Promise<AttachmentRow> {
  const r = await db("attachments")
    .where({ id })
    .whereNull("deleted_at")
    .first(
      "id",
      "owner_id",
      "project_id",
      "purpose",
      "file_key",
      "thumbnail_key",
      "file_name",
      "mime_type",
      "size_bytes",
    );
  if (!r) throw notFound("No such file.");
  const a: AttachmentRow = {
    id: Number(r.id),
    ownerId: Number(r.owner_id),
    projectId: r.project_id === null ? null : Number(r.project_id),
    purpose: r.purpose,
    fileKey: r.file_key,
    thumbnailKey: r.thumbnail_key ?? null,
    fileName: r.file_name,
    mimeType: r.mime_type,
    sizeBytes: r.size_bytes,
  };
  if (actor.role === "admin" || a.ownerId === actor.id) return a;
  if (a.purpose !== "credential_evidence" && a.projectId !== null && actor.role === "reviewer") {
    const job = await db("jobs as j")
      .join("requests as r", "r.id", "j.request_id")
      .where({ "r.project_id": a.projectId, "j.reviewer_id": actor.id })
      .whereNot("j.state", "cancelled")
      .first("j.id");
    if (job) return a;
    const open = await db("requests")
      .where({ project_id: a.projectId, status: "open" })
      .first("id");
    if (open && (await isVerifiedReviewer(db, actor.id))) return a;
  }
  throw forbidden("You do not have access to this file.");
}
