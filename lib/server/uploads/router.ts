import "server-only";
import { createUploadthing, type FileRouter } from "uploadthing/next";
import { UploadThingError } from "uploadthing/server";
import { fileTypeFromBuffer } from "file-type";
import { z } from "zod";
import {
  checkCredentialUpload,
  checkProjectUpload,
  recordCredentialEvidence,
  recordProjectFile,
  type ProjectFilePurpose,
  type StoredFile,
} from "@/lib/data/attachments";
import { HttpError } from "@/lib/data/errors";
import type { Actor } from "@/lib/data/actor";
import { PHOTO_TAGS } from "@/lib/validation/request";
import { getCurrentUser } from "../auth/session";
import { db } from "../db";
import { fetchStoredFile, UntrustedFileUrlError, utapi } from "./config";
import { storeCleanCopy } from "./clean";
import { MAX_FILE_BYTES } from "@/lib/uploads/config";

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
 * Called when the upload service confirms a file: read its bytes (only from the configured file
 * host), refuse a type that does not match the slug or a file over the size limit, replace it by
 * a clean re-encoded copy with a thumbnail (./clean.ts), then record that through lib/data, which
 * checks the per-project limits again with the project row locked. Any refusal deletes what was
 * stored, so nothing is half kept.
 */
async function recordUpload(
  slug: Slug,
  file: { key: string; name: string; size: number; ufsUrl: string },
  write: (stored: StoredFile) => Promise<number>,
): Promise<UploadResult> {
  const res = await fetchStoredFile(file.ufsUrl).catch((err: unknown) => {
    if (err instanceof UntrustedFileUrlError) return null;
    throw err;
  });
  // A file on another host is not ours to delete: refuse it and touch nothing.
  if (!res) return { ok: false, error: "The upload service reported a file we cannot read." };
  const refuse = async (error: string, keys: string[] = [file.key]): Promise<UploadResult> => {
    await utapi().deleteFiles(keys);
    return { ok: false, error };
  };
  const bytes = res.ok ? new Uint8Array(await res.arrayBuffer()) : new Uint8Array();
  const detected = bytes.length ? await fileTypeFromBuffer(bytes) : undefined;
  if (!detected || !(ALLOWED_TYPES[slug] as readonly string[]).includes(detected.mime))
    return refuse(
      `“${file.name}” is not a ${slug === "photo" ? "JPEG, PNG or WebP image" : "PDF or an image"} (by its content), so it was not kept.`,
    );
  if (bytes.length > MAX_FILE_BYTES[slug])
    return refuse(
      `“${file.name}” is larger than ${Math.round(MAX_FILE_BYTES[slug] / 1024 / 1024)} MB, so it was not kept.`,
    );
  const clean = await storeCleanCopy(file, detected.mime);
  if (!clean.ok) return clean;
  const c = clean.stored;
  const keys = [c.key, ...(c.thumbnailKey ? [c.thumbnailKey] : [])];
  try {
    const id = await write({
      key: c.key,
      name: file.name,
      sizeBytes: c.size,
      mimeType: c.mime,
      thumbnailKey: c.thumbnailKey,
      widthPx: c.width,
      heightPx: c.height,
    });
    return { ok: true, attachmentId: id };
  } catch (err) {
    if (err instanceof HttpError) return refuse(err.message, keys);
    await utapi().deleteFiles(keys);
    throw err;
  }
}

async function signedIn() {
  const user = await getCurrentUser();
  if (!user) throw new UploadThingError({ code: "FORBIDDEN", message: "Sign in to upload files." });
  return user;
}

/** Run a lib/data check in middleware; its refusal becomes the SDK's 4xx error. */
async function check(work: () => Promise<void>) {
  try {
    await work();
  } catch (err) {
    if (err instanceof HttpError)
      throw new UploadThingError({
        code: err.status === 403 ? "FORBIDDEN" : "BAD_REQUEST",
        message: err.message,
      });
    throw err;
  }
}

async function projectMiddleware(projectId: number, purpose: ProjectFilePurpose) {
  const user = await signedIn();
  await check(() => checkProjectUpload(db(), user, projectId, purpose));
  return { actor: { id: user.id, role: user.role } as Actor, projectId };
}

export const fileRouter = {
  credentialEvidence: f({
    pdf: { maxFileSize: "8MB", maxFileCount: 1 },
    image: { maxFileSize: "8MB", maxFileCount: 1 },
  })
    .input(z.object({ credentialId: z.number().int().positive() }))
    .middleware(async ({ input }) => {
      const user = await signedIn();
      await check(() => checkCredentialUpload(db(), user, input.credentialId));
      return { actor: { id: user.id, role: user.role } as Actor, credentialId: input.credentialId };
    })
    .onUploadComplete(({ metadata, file }) =>
      recordUpload("credentialEvidence", file, (stored) =>
        recordCredentialEvidence(db(), metadata.actor, metadata.credentialId, stored),
      ),
    ),
  sketch: f({
    pdf: { maxFileSize: "16MB", maxFileCount: 1 },
    image: { maxFileSize: "16MB", maxFileCount: 1 },
  })
    .input(z.object({ projectId: z.number().int().positive() }))
    .middleware(async ({ input }) => projectMiddleware(input.projectId, "sketch"))
    .onUploadComplete(({ metadata, file }) =>
      recordUpload("sketch", file, (stored) =>
        recordProjectFile(db(), metadata.actor, metadata.projectId, "sketch", stored, {
          caption: null,
          tag: null,
        }),
      ),
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
      ...(await projectMiddleware(input.projectId, "photo")),
      caption: input.caption || null,
      tag: input.tag,
    }))
    .onUploadComplete(({ metadata, file }) =>
      recordUpload("photo", file, (stored) =>
        recordProjectFile(db(), metadata.actor, metadata.projectId, "photo", stored, {
          caption: metadata.caption,
          tag: metadata.tag,
        }),
      ),
    ),
} satisfies FileRouter;

export type LoopwrightFileRouter = typeof fileRouter;
