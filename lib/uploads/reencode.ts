import sharp from "sharp";

/**
 * What we keep of an uploaded photo, sketch or credential scan. Images are decoded and
 * written afresh, so nothing of the upload's own bytes survives: no metadata (EXIF with GPS
 * positions, XMP, ICC comments), no data hidden after the image, no script body behind an
 * image signature (a "polyglot" does not decode and is refused). PDFs are kept as they are
 * once they start with the PDF signature.
 */
export type CleanMime = "image/jpeg" | "image/png" | "image/webp" | "application/pdf";

export interface CleanedUpload {
  mime: CleanMime;
  bytes: Buffer;
  /** A small WebP for pages (images only). */
  thumbnail: { bytes: Buffer; mime: "image/webp" } | null;
  width: number | null;
  height: number | null;
}

/** The upload is not what its type says (it does not decode, or a PDF lacks its signature). */
export class UnreadableUploadError extends Error {}

/** Longest side of a stored image; larger photos are scaled down (never up). */
export const MAX_IMAGE_SIDE = 4096;
/** Longest side of a thumbnail. */
export const THUMBNAIL_SIDE = 480;
/** Refuse decompression bombs: about 100 megapixels (a 48 MP phone photo is well under). */
const MAX_INPUT_PIXELS = 100_000_000;

type ImageMime = Exclude<CleanMime, "application/pdf">;
const IMAGE_MIMES: readonly string[] = ["image/jpeg", "image/png", "image/webp"];
const isImageMime = (mime: string): mime is ImageMime => IMAGE_MIMES.includes(mime);

function decoder(bytes: Buffer) {
  // failOn "error": a file that does not decode is refused; libvips' mere warnings are not.
  return sharp(bytes, { failOn: "error", limitInputPixels: MAX_INPUT_PIXELS });
}

/**
 * Decode and re-encode an upload whose content type (`mime`, sniffed from its bytes) is
 * JPEG, PNG, WebP or PDF. Images: turned upright by their EXIF orientation (`rotate()`),
 * scaled to at most MAX_IMAGE_SIDE, written in the same format with no metadata, plus a
 * THUMBNAIL_SIDE WebP thumbnail. Throws UnreadableUploadError when the bytes are not a
 * readable file of that type.
 */
export async function reencodeUpload(bytes: Buffer, mime: string): Promise<CleanedUpload> {
  if (mime === "application/pdf") {
    if (bytes.subarray(0, 5).toString("latin1") !== "%PDF-")
      throw new UnreadableUploadError("This file does not start like a PDF.");
    return { mime, bytes, thumbnail: null, width: null, height: null };
  }
  if (!isImageMime(mime)) throw new UnreadableUploadError(`Not an image we accept (${mime}).`);
  try {
    const upright = decoder(bytes).rotate().resize({
      width: MAX_IMAGE_SIDE,
      height: MAX_IMAGE_SIDE,
      fit: "inside",
      withoutEnlargement: true,
    });
    // sharp writes no metadata unless asked (withMetadata/keepExif): the output is pixels only.
    const encoded =
      mime === "image/jpeg"
        ? upright.jpeg({ quality: 85, mozjpeg: true })
        : mime === "image/png"
          ? upright.png({ compressionLevel: 9 })
          : upright.webp({ quality: 85 });
    const { data, info } = await encoded.toBuffer({ resolveWithObject: true });
    const thumbnail = await decoder(data)
      .resize({
        width: THUMBNAIL_SIDE,
        height: THUMBNAIL_SIDE,
        fit: "inside",
        withoutEnlargement: true,
      })
      .webp({ quality: 75 })
      .toBuffer();
    return {
      mime,
      bytes: data,
      thumbnail: { bytes: thumbnail, mime: "image/webp" },
      width: info.width,
      height: info.height,
    };
  } catch (err) {
    throw new UnreadableUploadError(
      `The image could not be read: ${err instanceof Error ? err.message.split("\n")[0] : "unknown error"}`,
    );
  }
}
