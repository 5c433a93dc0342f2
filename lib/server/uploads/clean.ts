import "server-only";
import { UTFile } from "uploadthing/server";
import { reencodeUpload, UnreadableUploadError } from "@/lib/uploads/reencode";
import { fetchStoredFile, utapi } from "./config";

/** What is recorded for an accepted upload: the clean copy's key, and its thumbnail's. */
export interface StoredUpload {
  key: string;
  mime: string;
  size: number;
  thumbnailKey: string | null;
  width: number | null;
  height: number | null;
}

export type CleanResult = { ok: true; stored: StoredUpload } | { ok: false; error: string };

const withoutExtension = (name: string) => name.replace(/\.[^.]*$/, "") || "file";

/**
 * Replace an uploaded file (already sniffed as `mime`) by a clean copy: images are decoded and
 * re-encoded without metadata (lib/uploads/reencode.ts) and stored again through the SDK with
 * a thumbnail, and the upload itself is deleted; a PDF is kept under its own key once it
 * starts with %PDF. A file that does not decode is deleted and refused with a message.
 */
export async function storeCleanCopy(
  file: { key: string; name: string; ufsUrl: string },
  mime: string,
): Promise<CleanResult> {
  const res = await fetchStoredFile(file.ufsUrl);
  if (!res.ok) return { ok: false, error: `“${file.name}” could not be read back; try again.` };
  const original = Buffer.from(await res.arrayBuffer());
  let cleaned;
  try {
    cleaned = await reencodeUpload(original, mime);
  } catch (err) {
    if (!(err instanceof UnreadableUploadError)) throw err;
    await utapi().deleteFiles(file.key);
    return {
      ok: false,
      error: `“${file.name}” could not be read as ${mime === "application/pdf" ? "a PDF" : "an image"}, so it was not kept.`,
    };
  }
  if (!cleaned.thumbnail) {
    return {
      ok: true,
      stored: {
        key: file.key,
        mime: cleaned.mime,
        size: original.length,
        thumbnailKey: null,
        width: null,
        height: null,
      },
    };
  }
  const [main, thumb] = await utapi().uploadFiles([
    new UTFile([new Uint8Array(cleaned.bytes)], file.name, { type: cleaned.mime }),
    new UTFile(
      [new Uint8Array(cleaned.thumbnail.bytes)],
      `${withoutExtension(file.name)}-thumbnail.webp`,
      { type: cleaned.thumbnail.mime },
    ),
  ]);
  if (!main?.data || !thumb?.data) {
    const stray = [main?.data?.key, thumb?.data?.key].filter((k): k is string => !!k);
    if (stray.length) await utapi().deleteFiles(stray);
    throw new Error(
      `Storing the clean copy failed: ${main?.error?.message ?? thumb?.error?.message ?? "unknown"}`,
    );
  }
  // The upload as sent (with its metadata) is not kept.
  await utapi().deleteFiles(file.key);
  return {
    ok: true,
    stored: {
      key: main.data.key,
      mime: cleaned.mime,
      size: cleaned.bytes.length,
      thumbnailKey: thumb.data.key,
      width: cleaned.width,
      height: cleaned.height,
    },
  };
}
