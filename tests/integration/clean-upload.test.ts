import { beforeAll, describe, expect, inject, it } from "vitest";
import sharp from "sharp";
import { UTApi, UTFile } from "uploadthing/server";
import { LOCAL_UPLOAD_KEYS, localUploadToken } from "@/lib/uploads/config";
import { pngPolyglot, tinyPdf } from "../support/uploads";

const uploadUrl = inject("uploadUrl");
const KEY_HEADER = { "x-uploadthing-api-key": LOCAL_UPLOAD_KEYS.apiKey };

/** The stored clean copy against the upload fake, as onUploadComplete runs it. */
describe("storeCleanCopy", () => {
  let api: UTApi;
  beforeAll(() => {
    // The upload fake from the global setup is the configured host (read on first use).
    process.env.UPLOADTHING_INGEST_URL = uploadUrl;
    api = new UTApi({ token: localUploadToken(), ingestUrl: uploadUrl, apiUrl: uploadUrl });
  });

  const put = async (name: string, type: string, bytes: Buffer) => {
    const r = await api.uploadFiles(new UTFile([new Uint8Array(bytes)], name, { type }));
    if (!r.data) throw new Error(String(r.error?.message));
    return { key: r.data.key, name, ufsUrl: r.data.ufsUrl };
  };
  const read = async (key: string) => {
    const res = await fetch(`${uploadUrl}/f/${key}`, { headers: KEY_HEADER });
    return res.ok ? Buffer.from(await res.arrayBuffer()) : null;
  };

  it("replaces a photo by a copy without EXIF or GPS, stores a thumbnail, deletes the upload", async () => {
    const { storeCleanCopy } = await import("@/lib/server/uploads/clean");
    const photo = await sharp({
      create: { width: 900, height: 600, channels: 3, background: "#2a6" },
    })
      .jpeg()
      .withExif({
        IFD0: { Make: "LoopTestCam" },
        IFD3: { GPSLatitudeRef: "N", GPSLatitude: "51/1 30/1 0/1" },
      })
      .toBuffer();
    const upload = await put("roof.jpg", "image/jpeg", photo);
    const r = await storeCleanCopy(upload, "image/jpeg");
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.stored.key).not.toBe(upload.key);
    expect(r.stored.mime).toBe("image/jpeg");
    expect([r.stored.width, r.stored.height]).toEqual([900, 600]);
    // The upload as sent is gone from the store.
    expect(await read(upload.key)).toBeNull();
    const clean = (await read(r.stored.key))!;
    expect(clean.length).toBe(r.stored.size);
    expect((await sharp(clean).metadata()).exif).toBeUndefined();
    expect(clean.includes(Buffer.from("LoopTestCam"))).toBe(false);
    const thumb = (await read(r.stored.thumbnailKey!))!;
    const t = await sharp(thumb).metadata();
    expect(t.format).toBe("webp");
    expect([t.width, t.height]).toEqual([480, 320]);
  });

  it("deletes and refuses a PNG signature with a script body", async () => {
    const { storeCleanCopy } = await import("@/lib/server/uploads/clean");
    const upload = await put("pump.png", "image/png", pngPolyglot());
    const r = await storeCleanCopy(upload, "image/png");
    expect(r).toEqual({
      ok: false,
      error: "“pump.png” could not be read as an image, so it was not kept.",
    });
    expect(await read(upload.key)).toBeNull();
  });

  it("keeps a PDF under its own key, with no thumbnail", async () => {
    const { storeCleanCopy } = await import("@/lib/server/uploads/clean");
    const upload = await put("sketch.pdf", "application/pdf", tinyPdf());
    const r = await storeCleanCopy(upload, "application/pdf");
    expect(r).toMatchObject({ ok: true, stored: { key: upload.key, thumbnailKey: null } });
    expect(await read(upload.key)).toEqual(tinyPdf());
  });
});
