import "server-only";
import { createUploadthing, type FileRouter } from "uploadthing/next";
import { UploadThingError } from "uploadthing/server";
import { fileTypeFromBuffer } from "file-type";
import { z } from "zod";
import { getCurrentUser } from "../auth/session";
import { db } from "../db";
import { fetchStoredFile, UntrustedFileUrlError, utapi } from "./config";
import { storeCleanCopy, type StoredUpload } from "./clean";
import { PHOTO_TAGS } from "@/lib/validation/request";

const f = createUploadthing();

/** What each slug accepts, checked again by the file's own bytes when it arrives. */
export const ALLOWED_TYPES = {
  credentialEvidence: ["application/pdf", "image/jpeg", "image/png", "image/webp"],
  sketch: ["application/pdf", "image/jpeg", "image/png", "image/webp"],
  photo: ["image/jpeg", "image/png", "image/webp"],
} as const;

type Slug = keyof typeof ALLOWED_TYPES;

export type UploadResult = { ok: true; attachmentId: number } | { ok: false; error: string };

/**
 * Called when the upload service confirms a file: read its first bytes, refuse a type that
 * does not match the slug (and delete the file, so nothing is half stored), replace it by a
 * clean re-encoded copy with a thumbnail (./clean.ts), and record that.
 */
async function recordUpload(
  slug: Slug,
  file: { key: string; name: string; size: number; ufsUrl: string },
  write: (stored: StoredUpload) => Promise<number>,
): Promise<UploadResult> {
  const head = await fetchStoredFile(file.ufsUrl, 4100).catch((err: unknown) => {
    if (err instanceof UntrustedFileUrlError) return null;
    throw err;
  });
  // A file on another host is not ours to delete: refuse it and touch nothing.
  if (!head) return { ok: false, error: "The upload service reported a file we cannot read." };
  const detected = head.ok
    ? await fileTypeFromBuffer(new Uint8Array(await head.arrayBuffer()))
    : undefined;
  if (!detected || !(ALLOWED_TYPES[slug] as readonly string[]).includes(detected.mime)) {
    await utapi().deleteFiles(file.key);
    return {
      ok: false,
      error: `“${file.name}” is not a ${slug === "photo" ? "JPEG, PNG or WebP image" : "PDF or an image"} (by its content), so it was not kept.`,
    };
  }
  const clean = await storeCleanCopy(file, detected.mime);
  if (!clean.ok) return clean;
  return { ok: true, attachmentId: await write(clean.stored) };
}

async function signedIn() {
  const user = await getCurrentUser();
  if (!user) throw new UploadThingError({ code: "FORBIDDEN", message: "Sign in to upload files." });
  return user;
}

export const fileRouter = {
  credentialEvidence: f({
    pdf: { maxFileSize: "8MB", maxFileCount: 1 },
    image: { maxFileSize: "8MB", maxFileCount: 1 },
  })
    .input(z.object({ credentialId: z.number().int().positive() }))
    .middleware(async ({ input }) => {
      const user = await signedIn();
      if (user.role !== "reviewer")
        throw new UploadThingError({
          code: "FORBIDDEN",
          message: "Only reviewers upload credential evidence.",
        });
      const credential = await db()("credentials")
        .where({ id: input.credentialId })
        .first("reviewer_id");
      if (!credential || Number(credential.reviewer_id) !== user.id)
        throw new UploadThingError({ code: "FORBIDDEN", message: "That credential is not yours." });
      return { userId: user.id, credentialId: input.credentialId };
    })
    .onUploadComplete(({ metadata, file }) =>
      recordUpload("credentialEvidence", file, (stored) =>
        db().transaction(async (trx) => {
          const [id] = await trx("attachments").insert({
            owner_id: metadata.userId,
            purpose: "credential_evidence",
            ...storedColumns(stored),
            file_name: file.name.slice(0, 255),
          });
          const old = await trx("credentials")
            .where({ id: metadata.credentialId })
            .first("evidence_attachment_id", "status");
          // New evidence sends a rejected credential back to the queue.
          await trx("credentials")
            .where({ id: metadata.credentialId })
            .update({
              evidence_attachment_id: id,
              ...(old?.status === "rejected" ? { status: "pending", admin_reason: null } : {}),
            });
          if (old?.evidence_attachment_id)
            await trx("attachments")
              .where({ id: old.evidence_attachment_id })
              .update({ deleted_at: trx.raw("CURRENT_TIMESTAMP(3)") });
          await trx("audit_log").insert({
            actor_id: metadata.userId,
            action: "credential.evidence_uploaded",
            entity_type: "reviewer",
            entity_id: metadata.userId,
            detail: JSON.stringify({
              credentialId: metadata.credentialId,
              attachmentId: Number(id),
            }),
          });
          return Number(id);
        }),
      ),
    ),
  sketch: f({
    pdf: { maxFileSize: "16MB", maxFileCount: 1 },
    image: { maxFileSize: "16MB", maxFileCount: 1 },
  })
    .input(z.object({ projectId: z.number().int().positive() }))
    .middleware(async ({ input }) => ({
      ...(await ownProject(input.projectId, "sketch")),
      caption: null,
      tag: null,
    }))
    .onUploadComplete(({ metadata, file }) =>
      recordUpload("sketch", file, (stored) => insertProjectFile(metadata, "sketch", file, stored)),
    ),
  photo: f({ image: { maxFileSize: "16MB", maxFileCount: 1 } })
    .input(
      z.object({
        projectId: z.number().int().positive(),
        caption: z.string().trim().max(200).optional(),
        tag: z.enum(PHOTO_TAGS).default("other"),
      }),
    )
    .middleware(async ({ input }) => ({
      ...(await ownProject(input.projectId, "photo")),
      caption: input.caption || null,
      tag: input.tag,
    }))
    .onUploadComplete(({ metadata, file }) =>
      recordUpload("photo", file, (stored) => insertProjectFile(metadata, "photo", file, stored)),
    ),
} satisfies FileRouter;

/** At most this many live files of each kind per project. */
export const PROJECT_FILE_LIMITS = { sketch: 3, photo: 20 } as const;

async function ownProject(projectId: number, purpose: "sketch" | "photo") {
  const user = await signedIn();
  if (user.role !== "homeowner")
    throw new UploadThingError({
      code: "FORBIDDEN",
      message: "Only the project's owner can add files to it.",
    });
  const project = await db()("projects")
    .where({ id: projectId })
    .whereNull("deleted_at")
    .first("owner_id");
  if (!project || Number(project.owner_id) !== user.id)
    throw new UploadThingError({ code: "FORBIDDEN", message: "That project is not yours." });
  const [{ n }] = (await db()("attachments")
    .where({ project_id: projectId, purpose })
    .whereNull("deleted_at")
    .count({ n: "*" })) as [{ n: number }];
  if (Number(n) >= PROJECT_FILE_LIMITS[purpose]) {
    throw new UploadThingError({
      code: "BAD_REQUEST",
      message: `A project can have at most ${PROJECT_FILE_LIMITS[purpose]} ${purpose === "photo" ? "photos" : "sketches"}: delete one first.`,
    });
  }
  return { userId: user.id, projectId };
}

async function insertProjectFile(
  meta: { userId: number; projectId: number; caption: string | null; tag: string | null },
  purpose: "sketch" | "photo",
  file: { name: string },
  stored: StoredUpload,
) {
  const [id] = await db()("attachments").insert({
    owner_id: meta.userId,
    project_id: meta.projectId,
    purpose,
    ...storedColumns(stored),
    file_name: file.name.slice(0, 255),
    caption: meta.caption,
    tag: meta.tag,
  });
  return Number(id);
}

/** The attachment columns for the stored clean copy. */
function storedColumns(s: StoredUpload) {
  return {
    file_key: s.key,
    thumbnail_key: s.thumbnailKey,
    mime_type: s.mime,
    size_bytes: s.size,
    width_px: s.width,
    height_px: s.height,
  };
}

export type LoopwrightFileRouter = typeof fileRouter;
