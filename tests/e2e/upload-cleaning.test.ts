import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { createHmac } from "node:crypto";
import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import type { Knex } from "knex";
import sharp from "sharp";
import { seedDemo, DEMO_PASSWORD, DEMO_USERS } from "@/db/seeds/demo";
import { testKnex, truncateAll } from "../support/db";
import { signInHttp } from "../support/session";
import { pngPolyglot, tinyPdf, uploadViaApp } from "../support/uploads";
import { LOCAL_UPLOAD_KEYS } from "@/lib/uploads/config";

const baseUrl = inject("baseUrl");
const uploadUrl = inject("uploadUrl");
const KEY_HEADER = { "x-uploadthing-api-key": LOCAL_UPLOAD_KEYS.apiKey };

/** A phone-like photo: EXIF with a camera make and a GPS position, rotated by orientation 6. */
const gpsPhoto = () =>
  sharp({ create: { width: 1200, height: 800, channels: 3, background: "#4477aa" } })
    .jpeg()
    .withExif({
      IFD0: { Make: "LoopTestCam" },
      IFD3: {
        GPSLatitudeRef: "N",
        GPSLatitude: "50/1 26/1 0/1",
        GPSLongitudeRef: "W",
        GPSLongitude: "3/1 33/1 0/1",
      },
    })
    .withMetadata({ orientation: 6 })
    .toBuffer();

describe("uploads are re-encoded on ingest, and callbacks never reach other hosts", () => {
  let knex: Knex;
  let home: string;
  let ownerId: number;
  let projectId: number;

  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
    await seedDemo(knex);
    home = (await signInHttp(baseUrl, DEMO_USERS.homeowners[0].email, DEMO_PASSWORD)).cookie;
    ownerId = (await knex("users").where({ email: DEMO_USERS.homeowners[0].email }).first("id")).id;
    projectId = (
      await knex("projects").where({ owner_id: ownerId }).whereNull("deleted_at").first("id")
    ).id;
  });
  afterAll(async () => {
    await truncateAll(knex);
    await knex.destroy();
  });

  const storedKeys = async () => {
    const res = await fetch(`${uploadUrl}/v6/listFiles`, {
      method: "POST",
      headers: KEY_HEADER,
      body: "{}",
    });
    return ((await res.json()) as { files: { key: string }[] }).files.map((f) => f.key);
  };

  it("stores a photo without its GPS position, upright, with a thumbnail", async () => {
    const photo = await gpsPhoto();
    const r = await uploadViaApp(
      baseUrl,
      home,
      "photo",
      { projectId, tag: "roof" },
      { name: "roof.jpg", type: "image/jpeg", bytes: photo },
    );
    expect(r.putStatus).toBe(200);
    expect(r.putBody?.serverData?.ok).toBe(true);
    const id = r.putBody!.serverData!.attachmentId!;
    const row = await knex("attachments").where({ id }).first();
    const [{ key: uploadedKey }] = r.presignBody as [{ key: string }];
    // The upload as sent is gone; the recorded file is the clean copy.
    expect(row.file_key).not.toBe(uploadedKey);
    expect(await storedKeys()).not.toContain(uploadedKey);
    expect(row.thumbnail_key).toBeTruthy();
    expect([row.width_px, row.height_px]).toEqual([800, 1200]);

    const served = await fetch(`${baseUrl}/api/files/${id}`, { headers: { cookie: home } });
    expect(served.status).toBe(200);
    expect(served.headers.get("content-type")).toBe("image/jpeg");
    const bytes = Buffer.from(await served.arrayBuffer());
    expect(bytes.length).toBe(row.size_bytes);
    const meta = await sharp(bytes).metadata();
    expect(meta.exif).toBeUndefined();
    expect(meta.orientation).toBeUndefined();
    expect([meta.width, meta.height]).toEqual([800, 1200]);
    expect(bytes.includes(Buffer.from("LoopTestCam"))).toBe(false);

    const thumb = await fetch(`${baseUrl}/api/files/${id}?variant=thumbnail`, {
      headers: { cookie: home },
    });
    expect(thumb.status).toBe(200);
    expect(thumb.headers.get("content-type")).toBe("image/webp");
    const t = await sharp(Buffer.from(await thumb.arrayBuffer())).metadata();
    expect([t.width, t.height]).toEqual([320, 480]);
    // The thumbnail is as private as the file.
    expect((await fetch(`${baseUrl}/api/files/${id}?variant=thumbnail`)).status).toBe(401);
  });

  it("keeps a PDF sketch as it is", async () => {
    const r = await uploadViaApp(
      baseUrl,
      home,
      "sketch",
      { projectId },
      { name: "loop.pdf", type: "application/pdf", bytes: tinyPdf() },
    );
    expect(r.putBody?.serverData?.ok).toBe(true);
    const row = await knex("attachments")
      .where({ id: r.putBody!.serverData!.attachmentId })
      .first();
    expect(row.thumbnail_key).toBeNull();
    const served = await fetch(`${baseUrl}/api/files/${row.id}`, { headers: { cookie: home } });
    expect(Buffer.from(await served.arrayBuffer())).toEqual(tinyPdf());
  });

  it("refuses a PNG signature with a script body and keeps nothing of it", async () => {
    const before = await storedKeys();
    const r = await uploadViaApp(
      baseUrl,
      home,
      "photo",
      { projectId, tag: "pump_station" },
      { name: "pump.png", type: "image/png", bytes: pngPolyglot() },
    );
    expect(r.putStatus).toBe(200);
    expect(r.putBody?.serverData).toEqual({
      ok: false,
      error: "“pump.png” could not be read as an image, so it was not kept.",
    });
    expect(await storedKeys()).toEqual(before);
    expect(await knex("attachments").where({ file_name: "pump.png" })).toHaveLength(0);
  });

  it("never replays an accepted upload's URL", async () => {
    const res = await fetch(`${baseUrl}/api/uploadthing?actionType=upload&slug=photo`, {
      method: "POST",
      headers: {
        "content-type": "application/json",
        cookie: home,
        "x-uploadthing-package": "@uploadthing/react",
        "x-uploadthing-version": "7.7.4",
      },
      body: JSON.stringify({
        files: [{ name: "v.jpg", size: 200_000, type: "image/jpeg", lastModified: Date.now() }],
        input: { projectId, tag: "vessel" },
      }),
    });
    const [{ url }] = (await res.json()) as [{ url: string }];
    const put = (bytes: Buffer) => {
      const form = new FormData();
      form.append("file", new Blob([new Uint8Array(bytes)], { type: "image/jpeg" }), "v.jpg");
      return fetch(url, { method: "PUT", body: form, signal: AbortSignal.timeout(10_000) });
    };
    const first = await put(await gpsPhoto());
    const body = (await first.json()) as { serverData: { ok: boolean; attachmentId: number } };
    expect(body.serverData.ok).toBe(true);
    const replay = await put(Buffer.from("\x7fELF not a photo"));
    expect(replay.status).toBe(403);
    const served = await fetch(`${baseUrl}/api/files/${body.serverData.attachmentId}`, {
      headers: { cookie: home },
    });
    expect(served.status).toBe(200);
    expect((await sharp(Buffer.from(await served.arrayBuffer())).metadata()).format).toBe("jpeg");
  });

  describe("a signed callback naming another host", () => {
    let attacker: Server;
    let attackerUrl: string;
    const received: string[] = [];
    beforeAll(async () => {
      attacker = createServer((req, res) => {
        received.push(`${req.method} ${req.url} key=${req.headers["x-uploadthing-api-key"]}`);
        res.writeHead(200, { "content-type": "image/png" }).end();
      });
      await new Promise<void>((r) => attacker.listen(0, "127.0.0.1", r));
      attackerUrl = `http://127.0.0.1:${(attacker.address() as AddressInfo).port}`;
    });
    afterAll(async () => {
      await new Promise<void>((r) => attacker.close(() => r()));
    });

    it("is never fetched, so the API key never leaves, and nothing is recorded", async () => {
      const key = "ForgedCallbackKey0001";
      const payload = JSON.stringify({
        status: "uploaded",
        file: {
          name: "evil.png",
          size: 10,
          type: "image/png",
          lastModified: Date.now(),
          customId: null,
          key,
          url: `${attackerUrl}/f/${key}`,
          appUrl: `${attackerUrl}/f/${key}`,
          ufsUrl: `${attackerUrl}/f/${key}`,
          fileHash: "0",
        },
        origin: uploadUrl,
        metadata: { userId: ownerId, projectId, caption: null, tag: "other" },
      });
      const signature = `hmac-sha256=${createHmac("sha256", LOCAL_UPLOAD_KEYS.apiKey).update(payload).digest("hex")}`;
      const res = await fetch(`${baseUrl}/api/uploadthing?slug=photo`, {
        method: "POST",
        headers: {
          "content-type": "application/json",
          "uploadthing-hook": "callback",
          "x-uploadthing-signature": signature,
        },
        body: payload,
      });
      expect(res.status).toBeLessThan(500);
      // onUploadComplete runs after the answer: give it time to (not) call out.
      await new Promise((r) => setTimeout(r, 2000));
      expect(received).toEqual([]);
      expect(await knex("attachments").where({ file_key: key })).toHaveLength(0);
    });
  });
});
