import "server-only";
import { UTApi } from "uploadthing/server";
import { env } from "@/lib/env";
import { decodeUploadToken, localUploadToken } from "@/lib/uploads/config";

/** The SDK's settings: the local fake by default, the real service when the environment says so. */
export function uploadConfig() {
  const e = env();
  const token = e.UPLOADTHING_TOKEN ?? localUploadToken();
  return {
    token,
    apiKey: decodeUploadToken(token).apiKey,
    ingestUrl: e.UPLOADTHING_INGEST_URL,
    apiUrl: e.UPLOADTHING_API_URL ?? e.UPLOADTHING_INGEST_URL,
    callbackUrl: `${e.APP_URL}/api/uploadthing`,
  };
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

/** The stored file's bytes (or its first `bytes`), read from the upload service with the API key. */
export async function fetchStoredFile(ufsUrl: string, bytes?: number): Promise<Response> {
  const c = uploadConfig();
  return fetch(ufsUrl, {
    headers: {
      "x-uploadthing-api-key": c.apiKey,
      ...(bytes ? { range: `bytes=0-${bytes - 1}` } : {}),
    },
  });
}
