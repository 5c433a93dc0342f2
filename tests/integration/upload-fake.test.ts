import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createHmac } from "node:crypto";
import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";
import { rmSync } from "node:fs";
import { startUploadFake } from "@/mocks/uploads/server";
import { UTApi, UTFile } from "uploadthing/server";
import { LOCAL_UPLOAD_KEYS, localUploadToken } from "@/lib/uploads/config";
import { tinyPdf, tinyPng } from "../support/uploads";

// Its own port and folder, beside the one the global setup starts for the app.
const PORT = 2700 + Number(process.env.TEST_PORT_OFFSET ?? 0);
const BASE = `http://127.0.0.1:${PORT}`;
const DIR = ".data/uploads-fake-test";
const KEY_HEADER = { "x-uploadthing-api-key": LOCAL_UPLOAD_KEYS.apiKey };

/** A presigned PUT URL as the SDK makes one (see generateSignedURL in @uploadthing/shared). */
function presign(key: string, size: number): string {
  const url = new URL(`${BASE}/${key}`);
  url.searchParams.append("expires", String(Date.now() + 60_000));
  url.searchParams.append("x-ut-identifier", LOCAL_UPLOAD_KEYS.appId);
  url.searchParams.append("x-ut-file-name", "photo.png");
  url.searchParams.append("x-ut-file-size", String(size));
  url.searchParams.append("x-ut-file-type", "image/png");
  const signature = `hmac-sha256=${createHmac("sha256", LOCAL_UPLOAD_KEYS.apiKey).update(url.href).digest("hex")}`;
  url.searchParams.append("signature", signature);
  return url.href;
}

const put = (url: string, bytes: Buffer) => {
  const form = new FormData();
  form.append("file", new Blob([new Uint8Array(bytes)]), "photo.png");
  // A hang would fail the test by this timeout instead of stalling the suite.
  return fetch(url, { method: "PUT", body: form, signal: AbortSignal.timeout(5000) });
};

describe("upload fake: single-use URLs, guarded reset, never in production", () => {
  let fake: { close: () => Promise<void> };
  let app: Server;
  let appUrl: string;
  const callbacks: string[] = [];
  /** How long the stand-in app takes to confirm each upload. */
  let confirmDelayMs = 0;

  beforeAll(async () => {
    rmSync(DIR, { recursive: true, force: true });
    fake = await startUploadFake({ port: PORT, dir: DIR, callbackTimeoutMs: 3000 });
    // A stand-in for the app's route handler: take the callback, then confirm the file.
    app = createServer((req, res) => {
      const chunks: Buffer[] = [];
      req.on("data", (c: Buffer) => chunks.push(c));
      req.on("end", () => {
        const { file } = JSON.parse(Buffer.concat(chunks).toString()) as { file: { key: string } };
        callbacks.push(file.key);
        res.writeHead(200).end("{}");
        setTimeout(() => {
          void fetch(`${BASE}/callback-result`, {
            method: "POST",
            headers: { ...KEY_HEADER, "content-type": "application/json" },
            body: JSON.stringify({ fileKey: file.key, callbackData: { ok: true } }),
          });
        }, confirmDelayMs);
      });
    });
    await new Promise<void>((r) => app.listen(0, "127.0.0.1", r));
    appUrl = `http://127.0.0.1:${(app.address() as AddressInfo).port}/api/uploadthing`;
  });
  afterAll(async () => {
    await fake.close();
    await new Promise<void>((r) => app.close(() => r()));
    rmSync(DIR, { recursive: true, force: true });
  });

  const register = (key: string) =>
    fetch(`${BASE}/route-metadata`, {
      method: "POST",
      headers: { ...KEY_HEADER, "content-type": "application/json" },
      body: JSON.stringify({
        fileKeys: [key],
        metadata: {},
        callbackUrl: appUrl,
        callbackSlug: "photo",
        awaitServerData: true,
      }),
    });
  const stored = async (key: string) => {
    const res = await fetch(`${BASE}/f/${key}`, { headers: KEY_HEADER });
    return res.ok ? Buffer.from(await res.arrayBuffer()) : null;
  };

  it("accepts one PUT; a replay gets 403 at once and leaves the stored file alone", async () => {
    const key = "SingleUseKey000001";
    expect((await register(key)).status).toBe(200);
    const url = presign(key, 4096);
    const first = await put(url, tinyPng());
    expect(first.status).toBe(200);
    expect(((await first.json()) as { serverData: unknown }).serverData).toEqual({ ok: true });
    expect(await stored(key)).toEqual(tinyPng());

    const replay = await put(url, tinyPdf());
    expect(replay.status).toBe(403);
    expect(((await replay.json()) as { error: string }).error).toMatch(/already been used/);
    // The accepted file is untouched, and the app heard of the file once.
    expect(await stored(key)).toEqual(tinyPng());
    expect(callbacks.filter((k) => k === key)).toHaveLength(1);
  });

  it("refuses a parallel replay while the first PUT still waits for the app", async () => {
    const key = "SingleUseKey000002";
    await register(key);
    const url = presign(key, 4096);
    confirmDelayMs = 1000;
    try {
      const first = put(url, tinyPng());
      await new Promise((r) => setTimeout(r, 200));
      const second = await put(url, tinyPdf());
      expect(second.status).toBe(403);
      expect((await first).status).toBe(200);
    } finally {
      confirmDelayMs = 0;
    }
    expect(await stored(key)).toEqual(tinyPng());
  });

  it("still refuses a replay after the file was deleted", async () => {
    const key = "SingleUseKey000003";
    await register(key);
    const url = presign(key, 4096);
    expect((await put(url, tinyPng())).status).toBe(200);
    await fetch(`${BASE}/v6/deleteFiles`, {
      method: "POST",
      headers: KEY_HEADER,
      body: JSON.stringify({ fileKeys: [key] }),
    });
    expect((await put(url, tinyPng())).status).toBe(403);
    expect(await stored(key)).toBeNull();
  });

  it("gives the URL back after a refusal that stored nothing, so the browser may retry", async () => {
    const key = "SingleUseKey000004";
    await register(key);
    const url = presign(key, 8);
    expect((await put(url, tinyPng())).status).toBe(400); // larger than declared
    const small = presign(key, 4096);
    expect((await put(small, tinyPng())).status).toBe(200);
  });

  it("resets only with the fake's API key", async () => {
    const key = "SingleUseKey000005";
    await register(key);
    expect((await put(presign(key, 4096), tinyPng())).status).toBe(200);
    const anon = await fetch(`${BASE}/_fake/reset`, { method: "POST" });
    expect(anon.status).toBe(401);
    const wrong = await fetch(`${BASE}/_fake/reset`, {
      method: "POST",
      headers: { "x-uploadthing-api-key": "sk_guess" },
    });
    expect(wrong.status).toBe(401);
    expect(await stored(key)).toEqual(tinyPng());
    const ok = await fetch(`${BASE}/_fake/reset`, { method: "POST", headers: KEY_HEADER });
    expect(ok.status).toBe(200);
    expect(await stored(key)).toBeNull();
  });

  it("stores a server-side upload from the SDK's UTApi.uploadFiles, with no callback", async () => {
    const api = new UTApi({ token: localUploadToken(), ingestUrl: BASE, apiUrl: BASE });
    const before = callbacks.length;
    const [a, b] = await api.uploadFiles([
      new UTFile([new Uint8Array(tinyPng())], "clean.png", { type: "image/png" }),
      new UTFile([new Uint8Array(tinyPdf())], "doc.pdf", { type: "application/pdf" }),
    ]);
    expect(a?.error).toBeNull();
    expect(b?.error).toBeNull();
    expect(await stored(a!.data!.key)).toEqual(tinyPng());
    expect(await stored(b!.data!.key)).toEqual(tinyPdf());
    expect(a!.data!.ufsUrl).toBe(`${BASE}/f/${a!.data!.key}`);
    expect(callbacks.length).toBe(before);
  });

  it("refuses to start with APP_ENV=production", async () => {
    await expect(
      startUploadFake({ port: PORT + 1, dir: DIR, appEnv: "production" }),
    ).rejects.toThrow(/APP_ENV=production/);
    const before = process.env.APP_ENV;
    process.env.APP_ENV = "production";
    try {
      await expect(startUploadFake({ port: PORT + 1, dir: DIR })).rejects.toThrow(/production/);
    } finally {
      if (before === undefined) delete process.env.APP_ENV;
      else process.env.APP_ENV = before;
    }
    // Nothing is listening there.
    await expect(fetch(`http://127.0.0.1:${PORT + 1}/health`)).rejects.toThrow("fetch failed");
  });
});
