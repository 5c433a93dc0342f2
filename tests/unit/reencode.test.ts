import { describe, expect, it } from "vitest";
import sharp from "sharp";
import { reencodeUpload, THUMBNAIL_SIDE, UnreadableUploadError } from "@/lib/uploads/reencode";
import { tinyPdf } from "../support/uploads";

/** A 600 × 300 photo carrying EXIF with a camera make, a GPS position and orientation 6 (90° clockwise). */
async function photoWithGps(): Promise<Buffer> {
  return sharp({ create: { width: 600, height: 300, channels: 3, background: "#3366cc" } })
    .jpeg()
    .withExif({
      IFD0: { Make: "LoopTestCam", Model: "GPS-1" },
      IFD3: {
        GPSLatitudeRef: "N",
        GPSLatitude: "51/1 30/1 0/1",
        GPSLongitudeRef: "W",
        GPSLongitude: "0/1 7/1 0/1",
      },
    })
    .withMetadata({ orientation: 6 })
    .toBuffer();
}

/** The GPS IFD pointer tag (0x8825) in either byte order. */
const hasGpsTag = (exif: Buffer) =>
  exif.includes(Buffer.from([0x88, 0x25])) || exif.includes(Buffer.from([0x25, 0x88]));

describe("reencodeUpload", () => {
  it("drops EXIF, GPS included, from a JPEG and turns it upright", async () => {
    const input = await photoWithGps();
    const before = await sharp(input).metadata();
    // The test input really carries what we mean to remove.
    expect(before.exif && hasGpsTag(before.exif)).toBe(true);
    expect(before.orientation).toBe(6);
    expect(input.includes(Buffer.from("LoopTestCam"))).toBe(true);

    const out = await reencodeUpload(input, "image/jpeg");
    expect(out.mime).toBe("image/jpeg");
    const after = await sharp(out.bytes).metadata();
    expect(after.format).toBe("jpeg");
    expect(after.exif).toBeUndefined();
    expect(after.xmp).toBeUndefined();
    expect(after.orientation).toBeUndefined();
    expect(out.bytes.includes(Buffer.from("LoopTestCam"))).toBe(false);
    expect(out.bytes.includes(Buffer.from("Exif\0\0"))).toBe(false);
    // Orientation 6 applied: the 600 × 300 landscape is now 300 × 600.
    expect([after.width, after.height]).toEqual([300, 600]);
    expect([out.width, out.height]).toEqual([300, 600]);
  });

  it("makes a WebP thumbnail no larger than the thumbnail size, also without metadata", async () => {
    const big = await sharp({
      create: { width: 1600, height: 1200, channels: 3, background: "#cc6633" },
    })
      .png()
      .toBuffer();
    const out = await reencodeUpload(big, "image/png");
    expect(out.thumbnail?.mime).toBe("image/webp");
    const t = await sharp(out.thumbnail!.bytes).metadata();
    expect(t.format).toBe("webp");
    expect(Math.max(t.width!, t.height!)).toBe(THUMBNAIL_SIDE);
    expect(t.exif).toBeUndefined();
    const gps = await reencodeUpload(await photoWithGps(), "image/jpeg");
    const tg = await sharp(gps.thumbnail!.bytes).metadata();
    expect(tg.exif).toBeUndefined();
    expect([tg.width, tg.height]).toEqual([240, 480]);
  });

  it("keeps the format it was given", async () => {
    const base = sharp({ create: { width: 20, height: 10, channels: 4, background: "#0000" } });
    expect(
      (
        await sharp(
          (await reencodeUpload(await base.clone().png().toBuffer(), "image/png")).bytes,
        ).metadata()
      ).format,
    ).toBe("png");
    expect(
      (
        await sharp(
          (await reencodeUpload(await base.clone().webp().toBuffer(), "image/webp")).bytes,
        ).metadata()
      ).format,
    ).toBe("webp");
  });

  it("refuses a file whose first bytes are PNG but whose body is a script", async () => {
    const polyglot = Buffer.concat([
      Buffer.from("89504e470d0a1a0a", "hex"),
      Buffer.from("<script>fetch('/api/files/1').then(r=>r.text()).then(alert)</script>"),
    ]);
    await expect(reencodeUpload(polyglot, "image/png")).rejects.toBeInstanceOf(
      UnreadableUploadError,
    );
  });

  it("drops a script appended after a real image", async () => {
    const png = await sharp({ create: { width: 8, height: 8, channels: 3, background: "#fff" } })
      .png()
      .toBuffer();
    const tail = Buffer.from("<script>alert(document.cookie)</script>");
    const out = await reencodeUpload(Buffer.concat([png, tail]), "image/png");
    expect(out.bytes.includes(tail)).toBe(false);
    expect((await sharp(out.bytes).metadata()).width).toBe(8);
  });

  it("refuses a truncated JPEG", async () => {
    const jpg = await sharp({
      create: { width: 300, height: 200, channels: 3, background: "#963" },
    })
      .jpeg()
      .toBuffer();
    await expect(
      reencodeUpload(jpg.subarray(0, jpg.length / 2), "image/jpeg"),
    ).rejects.toBeInstanceOf(UnreadableUploadError);
  });

  it("keeps a PDF as it is, but only when it starts with %PDF-", async () => {
    const pdf = tinyPdf();
    const out = await reencodeUpload(pdf, "application/pdf");
    expect(out.bytes).toEqual(pdf);
    expect(out.thumbnail).toBeNull();
    await expect(
      reencodeUpload(Buffer.concat([Buffer.from("  "), pdf]), "application/pdf"),
    ).rejects.toBeInstanceOf(UnreadableUploadError);
    await expect(reencodeUpload(Buffer.from("<html>"), "text/html")).rejects.toBeInstanceOf(
      UnreadableUploadError,
    );
  });
});
