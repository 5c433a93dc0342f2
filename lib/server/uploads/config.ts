import "server-only";
import { UTApi } from "uploadthing/server";
import { env } from "@/lib/env";
import { decodeUploadToken, localUploadToken, trustedStoredFileUrl } from "@/lib/uploads/config";

/** The SDK's settings: the local fake by default, the real service when the environment says so. */
export function uploadConfig() {
  const e = env();
  // The public local key only outside production (lib/env.ts refuses to start without a token).
  const token =
    e.UPLOADTHING_TOKEN ?? (e.APP_ENV === "production" ? missingToken() : localUploadToken());
  return {
    token,
    apiKey: decodeUploadToken(token).apiKey,
    ingestUrl: e.UPLOADTHING_INGEST_URL,
    apiUrl: e.UPLOADTHING_API_URL ?? e.UPLOADTHING_INGEST_URL,
    filesUrl: e.UPLOADTHING_FILES_URL ?? e.UPLOADTHING_INGEST_URL,
    callbackUrl: `${e.APP_URL}/api/uploadthing`,
  };
}

function missingToken(): never {
  throw new Error("UPLOADTHING_TOKEN is required in production");
}

let api: UTApi | undefined;
export function utapi(): UTApi {
  const c = uploadConfig();
  api ??= new UTApi({
    token: c.token,
    apiUrl: c.apiUrl,
    ingestUrl: c.ingestUrl,
    logLevel: "Error",
  });
  return api;
}

export class UntrustedFileUrlError extends Error {}

/**
 * The stored file's bytes (or its first `bytes`), read from the upload service with the API
 * key — only from the configured file host: any other URL throws UntrustedFileUrlError before
 * a request is made, and redirects are not followed (they would carry the key elsewhere).
 */
export async function fetchStoredFile(ufsUrl: string, bytes?: number): Promise<Response> {
  const c = uploadConfig();
  const url = trustedStoredFileUrl(ufsUrl, c.filesUrl);
  if (!url) throw new UntrustedFileUrlError("The file is not on the configured upload host.");
  return fetch(url, {
    redirect: "error",
    headers: {
      "x-uploadthing-api-key": c.apiKey,
      ...(bytes ? { range: `bytes=0-${bytes - 1}` } : {}),
    },
  });
}
