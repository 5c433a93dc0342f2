import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import { createServer, type Server } from "node:http";
import type { AddressInfo } from "node:net";

const uploadUrl = inject("uploadUrl");

/**
 * fetchStoredFile sends the upload API key, so it must never reach a host other than the
 * configured file host: a stand-in "attacker" server counts what it receives.
 */
describe("fetchStoredFile only talks to the configured upload host", () => {
  let attacker: Server;
  let attackerUrl: string;
  const received: { url?: string; apiKey?: string | string[] }[] = [];

  beforeAll(async () => {
    // The upload fake started by the global setup is the configured host (read on first use).
    process.env.UPLOADTHING_INGEST_URL = uploadUrl;
    attacker = createServer((req, res) => {
      received.push({ url: req.url, apiKey: req.headers["x-uploadthing-api-key"] });
      res.writeHead(200, { "content-type": "image/png" });
      res.end("\x89PNG\r\n\x1a\n");
    });
    await new Promise<void>((r) => attacker.listen(0, "127.0.0.1", r));
    attackerUrl = `http://127.0.0.1:${(attacker.address() as AddressInfo).port}`;
  });
  afterAll(async () => {
    await new Promise<void>((r) => attacker.close(() => r()));
  });

  it("reads from the configured host with the API key", async () => {
    const { fetchStoredFile } = await import("@/lib/server/uploads/config");
    // The fake answers 404 for an unknown key only when the key is right (403 without it).
    const res = await fetchStoredFile(`${uploadUrl}/f/NoSuchStoredKey1234`);
    expect(res.status).toBe(404);
  });

  it("refuses a URL on any other host before sending anything", async () => {
    const { fetchStoredFile, UntrustedFileUrlError } = await import("@/lib/server/uploads/config");
    for (const url of [
      `${attackerUrl}/f/AttackerKey123456`,
      `${attackerUrl}/anything`,
      `${uploadUrl}/v6/deleteFiles`,
      `${uploadUrl.replace("127.0.0.1", "localhost")}/f/AttackerKey123456`,
    ]) {
      await expect(fetchStoredFile(url, 4100)).rejects.toBeInstanceOf(UntrustedFileUrlError);
    }
    expect(received).toEqual([]);
  });
});
