import { idSchema } from "@/lib/validation/id";
import { requireUser } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { HttpError } from "@/lib/data/errors";
import { errorResponse } from "@/lib/server/http";
import { getReadableAttachment } from "@/lib/data/files";
import { fetchStoredFile, uploadConfig } from "@/lib/server/uploads/config";

/**
 * A private file, streamed from the upload service after the access check; never a public URL.
 * `?variant=thumbnail` gives the small WebP made on ingest (the file itself when it has none).
 */
export async function GET(req: Request, ctx: { params: Promise<{ id: string }> }) {
  try {
    const user = await requireUser();
    const id = idSchema.safeParse((await ctx.params).id);
    if (!id.success) throw new HttpError(400, "The file id must be a positive whole number.");
    const a = await getReadableAttachment(db(), user, id.data);
    const thumb = new URL(req.url).searchParams.get("variant") === "thumbnail" && a.thumbnailKey;
    const key = thumb ? a.thumbnailKey : a.fileKey;
    const stored = await fetchStoredFile(`${uploadConfig().filesUrl}/f/${key}`);
    if (!stored.ok || !stored.body) throw new HttpError(404, "The file is no longer stored.");
    return new Response(stored.body, {
      headers: {
        "content-type": thumb ? "image/webp" : a.mimeType,
        "content-disposition": `inline; filename="${a.fileName.replace(/[^\w.\- ]/g, "_")}"`,
        "cache-control": "private, no-store",
        "x-content-type-options": "nosniff",
      },
    });
  } catch (err) {
    return errorResponse(err);
  }
}
