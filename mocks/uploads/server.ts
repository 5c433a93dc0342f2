/**
 * Local fake of the upload service's ingest and file API, for the uploadthing SDK (v7) in
 * its production flow: the app's route handler registers the route metadata here, the
 * browser HEADs and PUTs the file to a presigned URL, this server checks the URL's signature
 * and expiry, stores the file under .data/uploads, POSTs the signed callback to the app, waits
 * for the app's /callback-result, and answers the PUT with the server data.
 *
 *   POST /route-metadata, PUT|HEAD /:key?signed, POST /callback-result
 *   (a PUT for a key with no route registered is a server-side UTApi.uploadFiles: stored, no callback)
 *   GET  /f/:key        the file (needs the API key header, or a signed URL)
 *   POST /v6/deleteFiles, /v6/listFiles, /v6/getFileUrl
 *   POST /_fake/reset (API key only), GET /health
 *
 * A presigned URL is single-use: once a PUT to it is under way or done, another PUT to the
 * same file key gets 403 at once, so a replay can neither overwrite nor remove the accepted
 * file. The fake refuses to start when APP_ENV=production.
 */
import { createServer, type IncomingMessage, type ServerResponse } from "node:http";
import { createHash, createHmac, timingSafeEqual } from "node:crypto";
import { existsSync, mkdirSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { LOCAL_UPLOAD_KEYS } from "../../lib/uploads/config";

interface StoredMeta {
  key: string;
  name: string;
  size: number;
  type: string;
  customId: string | null;
  fileHash: string;
  uploadedAt: number;
}

interface RouteRegistration {
  callbackUrl: string;
  metadata: unknown;
  awaitServerData: boolean;
}

export interface UploadFakeOptions {
  port?: number;
  dir?: string;
  apiKey?: string;
  appId?: string;
  /** How long a PUT waits for the app's callback result before giving up. */
  callbackTimeoutMs?: number;
  /** The environment it would run in (process.env.APP_ENV by default); "production" is refused. */
  appEnv?: string;
}

const CORS = {
  "access-control-allow-origin": "*",
  "access-control-allow-methods": "GET, HEAD, PUT, POST, OPTIONS",
  "access-control-allow-headers":
    "range, x-uploadthing-version, b3, traceparent, content-type, x-uploadthing-api-key",
  "access-control-expose-headers": "x-ut-range-start",
};

const sign = (payload: string, key: string) =>
  `hmac-sha256=${createHmac("sha256", key).update(payload).digest("hex")}`;

function sameSignature(a: string, b: string): boolean {
  const x = Buffer.from(a);
  const y = Buffer.from(b);
  return x.length === y.length && timingSafeEqual(x, y);
}

function readBody(req: IncomingMessage): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    req.on("data", (c: Buffer) => chunks.push(c));
    req.on("end", () => resolve(Buffer.concat(chunks)));
    req.on("error", reject);
  });
}

/** The file part of a multipart/form-data body (field "file"). */
async function multipartFile(req: IncomingMessage, body: Buffer): Promise<Buffer | null> {
  const type = req.headers["content-type"] ?? "";
  const form = await new Response(new Uint8Array(body), { headers: { "content-type": type } })
    .formData()
    .catch(() => null);
  const file = form?.get("file");
  if (!file || typeof file === "string") return null;
  return Buffer.from(await file.arrayBuffer());
}

export function startUploadFake(options: UploadFakeOptions = {}) {
  if ((options.appEnv ?? process.env.APP_ENV) === "production") {
    return Promise.reject(
      new Error(
        "The upload fake is for development and tests: it does not run with APP_ENV=production.",
      ),
    );
  }
  const port = options.port ?? Number(process.env.UPLOAD_FAKE_PORT ?? 2590);
  const dir = options.dir ?? join(process.cwd(), ".data", "uploads");
  const apiKey = options.apiKey ?? LOCAL_UPLOAD_KEYS.apiKey;
  const appId = options.appId ?? LOCAL_UPLOAD_KEYS.appId;
  const timeoutMs = options.callbackTimeoutMs ?? 15_000;
  const base = `http://127.0.0.1:${port}`;
  mkdirSync(dir, { recursive: true });

  const routes = new Map<string, RouteRegistration>();
  /** File keys whose presigned URL has been used (a PUT under way or stored). */
  const usedKeys = new Set<string>();
  type CallbackOutcome = { data: unknown } | { failed: string };
  const waiting = new Map<string, (outcome: CallbackOutcome) => void>();
  const metaPath = (key: string) => join(dir, `${key}.json`);
  const filePath = (key: string) => join(dir, `${key}.bin`);
  const readMeta = (key: string): StoredMeta | null =>
    existsSync(metaPath(key))
      ? (JSON.parse(readFileSync(metaPath(key), "utf8")) as StoredMeta)
      : null;
  const fileUrl = (key: string) => `${base}/f/${key}`;

  /** Check a presigned URL: signature over the URL without it, expiry, and app id. */
  function verifyPresigned(req: IncomingMessage): URLSearchParams | null {
    const raw = `${base}${req.url ?? ""}`;
    const at = raw.lastIndexOf("&signature=");
    if (at < 0) return null;
    const payload = raw.slice(0, at);
    const signature = decodeURIComponent(raw.slice(at + "&signature=".length));
    if (!sameSignature(sign(payload, apiKey), signature)) return null;
    const params = new URL(payload).searchParams;
    if (Number(params.get("expires")) < Date.now()) return null;
    if (decodeURIComponent(params.get("x-ut-identifier") ?? "") !== appId) return null;
    return params;
  }

  const send = (
    res: ServerResponse,
    status: number,
    body: unknown,
    headers: Record<string, string> = {},
  ) => {
    res.writeHead(status, { "content-type": "application/json", ...CORS, ...headers });
    res.end(JSON.stringify(body));
  };
  const hasApiKey = (req: IncomingMessage) => req.headers["x-uploadthing-api-key"] === apiKey;

  const server = createServer(async (req, res) => {
    const url = new URL(req.url ?? "/", base);
    const path = url.pathname;
    try {
      if (req.method === "OPTIONS") {
        res.writeHead(204, CORS);
        return res.end();
      }
      if (path === "/health") return send(res, 200, { ok: true });
      if (path === "/_fake/reset" && req.method === "POST") {
        if (!hasApiKey(req)) return send(res, 401, { error: "Invalid API key" });
        for (const f of readdirSync(dir)) rmSync(join(dir, f), { force: true });
        routes.clear();
        usedKeys.clear();
        return send(res, 200, { ok: true });
      }
      if (path === "/route-metadata" && req.method === "POST") {
        if (!hasApiKey(req)) return send(res, 401, { error: "Invalid API key" });
        const body = JSON.parse((await readBody(req)).toString("utf8")) as {
          fileKeys: string[];
          metadata: unknown;
          callbackUrl: string;
          callbackSlug: string;
          awaitServerData?: boolean;
        };
        // As the real service does, the callback goes to callbackUrl with ?slug=callbackSlug.
        const callback = new URL(body.callbackUrl);
        callback.searchParams.set("slug", body.callbackSlug);
        for (const key of body.fileKeys)
          routes.set(key, {
            callbackUrl: callback.href,
            metadata: body.metadata,
            awaitServerData: body.awaitServerData ?? true,
          });
        return send(res, 200, { ok: true });
      }
      if (path === "/callback-result" && req.method === "POST") {
        if (!hasApiKey(req)) return send(res, 401, { error: "Invalid API key" });
        const body = JSON.parse((await readBody(req)).toString("utf8")) as {
          fileKey: string;
          callbackData?: unknown;
          error?: string;
        };
        waiting.get(body.fileKey)?.(
          body.error ? { failed: body.error } : { data: body.callbackData ?? null },
        );
        waiting.delete(body.fileKey);
        return send(res, 200, { ok: true });
      }
      const keyMatch = path.match(/^\/([A-Za-z0-9_-]{10,200})$/);
      if (keyMatch && (req.method === "HEAD" || req.method === "PUT")) {
        const key = keyMatch[1]!;
        const params = verifyPresigned(req);
        if (!params) return send(res, 403, { error: "Invalid or expired signature" });
        if (req.method === "HEAD") {
          res.writeHead(200, { ...CORS, "x-ut-range-start": "0" });
          return res.end();
        }
        // Single use: claim the key before reading the body, so a parallel replay is refused too.
        if (usedKeys.has(key) || existsSync(metaPath(key))) {
          req.resume();
          return send(res, 403, { error: "This upload URL has already been used" });
        }
        usedKeys.add(key);
        const route = routes.get(key);
        // Refusals before anything is stored give the URL back, so the browser may retry.
        const refuse = (error: string) => {
          usedKeys.delete(key);
          return send(res, 400, { error });
        };
        const bytes = await multipartFile(req, await readBody(req));
        if (!bytes) return refuse("Expected a multipart body with a `file` field");
        const declaredSize = Number(decodeURIComponent(params.get("x-ut-file-size") ?? "0"));
        if (declaredSize && bytes.length > declaredSize) return refuse("File larger than declared");
        const meta: StoredMeta = {
          key,
          name: decodeURIComponent(params.get("x-ut-file-name") ?? key),
          size: bytes.length,
          type: decodeURIComponent(params.get("x-ut-file-type") ?? "application/octet-stream"),
          customId: params.get("x-ut-custom-id")
            ? decodeURIComponent(params.get("x-ut-custom-id")!)
            : null,
          fileHash: createHash("md5").update(bytes).digest("hex"),
          uploadedAt: Date.now(),
        };
        writeFileSync(filePath(key), bytes);
        writeFileSync(metaPath(key), JSON.stringify(meta));
        const file = {
          name: meta.name,
          size: meta.size,
          type: meta.type,
          lastModified: meta.uploadedAt,
          customId: meta.customId,
          key,
          url: fileUrl(key),
          appUrl: fileUrl(key),
          ufsUrl: fileUrl(key),
          fileHash: meta.fileHash,
        };
        // No route registered: a server-side upload (UTApi.uploadFiles), stored with no callback.
        if (!route)
          return send(res, 200, {
            url: file.url,
            appUrl: file.appUrl,
            ufsUrl: file.ufsUrl,
            fileHash: file.fileHash,
          });
        const result = new Promise<CallbackOutcome>((resolve) => {
          waiting.set(key, resolve);
          setTimeout(() => {
            if (waiting.delete(key))
              resolve({ failed: "The app did not confirm the upload in time" });
          }, timeoutMs).unref();
        });
        const payload = JSON.stringify({
          status: "uploaded",
          file,
          origin: base,
          metadata: route.metadata,
        });
        const cb = await fetch(route.callbackUrl, {
          method: "POST",
          headers: {
            "content-type": "application/json",
            "uploadthing-hook": "callback",
            "x-uploadthing-signature": sign(payload, apiKey),
          },
          body: payload,
        }).catch((err: unknown) => ({ ok: false, status: 0, statusText: String(err) }) as Response);
        if (!cb.ok) {
          waiting.delete(key);
          const detail =
            "text" in cb && typeof cb.text === "function" ? await cb.text().catch(() => "") : "";
          return send(res, 502, {
            error:
              `App callback to ${route.callbackUrl} failed: ${cb.status} ${cb.statusText} ${detail}`.trim(),
          });
        }
        const outcome: CallbackOutcome = route.awaitServerData ? await result : { data: null };
        if ("failed" in outcome) return send(res, 200, { error: outcome.failed });
        return send(res, 200, {
          url: file.url,
          appUrl: file.appUrl,
          ufsUrl: file.ufsUrl,
          fileHash: file.fileHash,
          serverData: outcome.data,
        });
      }
      const fileMatch = path.match(/^\/f\/([A-Za-z0-9_-]{10,200})$/);
      if (fileMatch && req.method === "GET") {
        const key = fileMatch[1]!;
        if (!hasApiKey(req))
          return send(res, 403, { error: "Private file: API key or signed URL required" });
        const meta = readMeta(key);
        if (!meta || !existsSync(filePath(key))) return send(res, 404, { error: "Not found" });
        const bytes = readFileSync(filePath(key));
        const range = req.headers.range?.match(/^bytes=(\d+)-(\d+)?$/);
        const slice = range
          ? bytes.subarray(Number(range[1]), range[2] ? Number(range[2]) + 1 : undefined)
          : bytes;
        res.writeHead(range ? 206 : 200, {
          "content-type": meta.type,
          "content-length": String(slice.length),
        });
        return res.end(slice);
      }
      if (path.startsWith("/v6/") && req.method === "POST") {
        if (!hasApiKey(req)) return send(res, 401, { error: "Invalid API key" });
        const body = JSON.parse((await readBody(req)).toString("utf8") || "{}") as {
          fileKeys?: string[];
        };
        if (path === "/v6/deleteFiles") {
          let deletedCount = 0;
          for (const key of body.fileKeys ?? []) {
            if (existsSync(metaPath(key))) deletedCount += 1;
            rmSync(metaPath(key), { force: true });
            rmSync(filePath(key), { force: true });
          }
          return send(res, 200, { success: true, deletedCount });
        }
        if (path === "/v6/listFiles") {
          const files = readdirSync(dir)
            .filter((f) => f.endsWith(".json"))
            .map((f) => JSON.parse(readFileSync(join(dir, f), "utf8")) as StoredMeta)
            .map((m) => ({
              id: m.key,
              customId: m.customId,
              key: m.key,
              name: m.name,
              size: m.size,
              status: "Uploaded" as const,
              uploadedAt: m.uploadedAt,
            }));
          return send(res, 200, { hasMore: false, files });
        }
        if (path === "/v6/getFileUrl")
          return send(res, 200, {
            data: (body.fileKeys ?? []).map((key) => ({ key, url: fileUrl(key) })),
          });
      }
      send(res, 404, { error: "Not found" });
    } catch (err) {
      send(res, 500, { error: err instanceof Error ? err.message : "error" });
    }
  });

  return new Promise<{ port: number; close: () => Promise<void> }>((resolve, reject) => {
    server.on("error", reject);
    server.listen(port, "127.0.0.1", () =>
      resolve({ port, close: () => new Promise<void>((done) => server.close(() => done())) }),
    );
  });
}

if (process.argv[1] && /mocks[\\/]uploads[\\/]server\.ts$/.test(process.argv[1])) {
  startUploadFake().then(
    ({ port }) => console.log(`[upload-fake] ingest on http://127.0.0.1:${port}`),
    (err: unknown) => {
      console.error("[upload-fake] failed to start:", err);
      process.exit(1);
    },
  );
}
