/**
 * Content sniffing of a finished upload, without a build: the upload router's own
 * onUploadComplete is called as the upload SDK calls it, against the upload fake and the test
 * database. The type is read from the bytes, never from the name or the declared type; a
 * refusal deletes what was stored and records nothing.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Knex } from "knex";
import { UTApi, UTFile } from "uploadthing/server";
import { LOCAL_UPLOAD_KEYS, localUploadToken } from "@/lib/uploads/config";
import { elfBytes, tinyPdf, tinyPng } from "../support/uploads";
import { testKnex, truncateAll } from "../support/db";
import { makeHomeowner, makeProject, type ProjectFixture } from "../support/fixtures";

const uploadUrl = inject("uploadUrl");
const KEY_HEADER = { "x-uploadthing-api-key": LOCAL_UPLOAD_KEYS.apiKey };

type Complete = (a: {
  metadata: Record<string, unknown>;
  file: Record<string, unknown>;
}) => Promise<{ ok: true; attachmentId: number } | { ok: false; error: string }>;

describe("content sniffing of finished uploads", () => {
  let knex: Knex;
  let api: UTApi;
  let project: ProjectFixture;
  let router: Record<"photo" | "sketch", { onUploadComplete: Complete }>;
  beforeAll(async () => {
    process.env.DB_TARGET = "test";
    process.env.UPLOADTHING_INGEST_URL = uploadUrl;
    knex = testKnex();
    await truncateAll(knex);
    api = new UTApi({ token: localUploadToken(), ingestUrl: uploadUrl, apiUrl: uploadUrl });
    project = await makeProject(knex, await makeHomeowner(knex));
    router = (await import("@/lib/server/uploads/router")).fileRouter as never;
  });
  afterAll(async () => {
    await truncateAll(knex);
    await knex.destroy();
    const { getDb } = await import("@/lib/data/db");
    await getDb().destroy();
  });

  const put = async (name: string, type: string, bytes: Buffer) => {
    const r = await api.uploadFiles(new UTFile([new Uint8Array(bytes)], name, { type }));
    if (!r.data) throw new Error(String(r.error?.message));
    return { key: r.data.key, name, size: bytes.length, ufsUrl: r.data.ufsUrl };
  };
  const stored = async (key: string) =>
    (await fetch(`${uploadUrl}/f/${key}`, { headers: KEY_HEADER })).ok;
  const complete = (slug: "photo" | "sketch", file: Awaited<ReturnType<typeof put>>) =>
    router[slug].onUploadComplete({
      metadata: {
        actor: { id: project.ownerId, role: "homeowner" },
        projectId: project.id,
        caption: null,
        tag: "other",
      },
      file,
    });

  it("refuses a program named and declared as a photo, deletes it and records nothing", async () => {
    const file = await put("loft.jpg", "image/jpeg", elfBytes());
    expect(await complete("photo", file)).toEqual({
      ok: false,
      error: "“loft.jpg” is not a JPEG, PNG or WebP image (by its content), so it was not kept.",
    });
    expect(await stored(file.key)).toBe(false);
    expect(await knex("attachments")).toHaveLength(0);
  });

  it("refuses a PDF as a photo but keeps it as a sketch", async () => {
    const asPhoto = await put("roof.png", "image/png", tinyPdf());
    expect(await complete("photo", asPhoto)).toMatchObject({ ok: false });
    expect(await stored(asPhoto.key)).toBe(false);
    const asSketch = await put("sketch.pdf", "application/pdf", tinyPdf());
    const r = await complete("sketch", asSketch);
    expect(r.ok).toBe(true);
    const row = await knex("attachments").where({ project_id: project.id }).first();
    expect(row).toMatchObject({ purpose: "sketch", mime_type: "application/pdf" });
  });

  it("takes the type from the bytes: a PNG sent as a PDF is kept as an image", async () => {
    const file = await put("pump.pdf", "application/pdf", tinyPng());
    const r = await complete("photo", file);
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    const row = await knex("attachments").where({ id: r.attachmentId }).first();
    expect(row).toMatchObject({ purpose: "photo", mime_type: "image/png" });
  });

  it("refuses an empty file as unreadable content", async () => {
    const file = await put("empty.jpg", "image/jpeg", Buffer.alloc(0));
    expect(await complete("photo", file)).toMatchObject({
      ok: false,
      error: expect.stringMatching(/is not a JPEG, PNG or WebP image \(by its content\)/),
    });
  });
});
