import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Knex } from "knex";
import { seedDemo, DEMO_PASSWORD, DEMO_USERS } from "@/db/seeds/demo";
import { testKnex, truncateAll } from "../support/db";
import { signInHttp } from "../support/session";
import { elfBytes, tinyPdf, tinyPng, uploadViaApp } from "../support/uploads";
import { LOCAL_UPLOAD_KEYS } from "@/lib/uploads/config";

const baseUrl = inject("baseUrl");
const uploadUrl = inject("uploadUrl");

describe("credential evidence through the upload SDK's route handler and the fake ingest server", () => {
  let knex: Knex;
  let sol: string;
  let ines: string;
  let home: string;
  let admin: string;
  let solCredential: number;

  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
    await seedDemo(knex);
    await fetch(`${uploadUrl}/_fake/reset`, {
      method: "POST",
      headers: { "x-uploadthing-api-key": LOCAL_UPLOAD_KEYS.apiKey },
    });
    [sol, ines, home, admin] = (
      await Promise.all([
        signInHttp(baseUrl, DEMO_USERS.reviewers[0].email, DEMO_PASSWORD),
        signInHttp(baseUrl, DEMO_USERS.reviewers[1].email, DEMO_PASSWORD),
        signInHttp(baseUrl, DEMO_USERS.homeowners[0].email, DEMO_PASSWORD),
        signInHttp(baseUrl, DEMO_USERS.admin.email, DEMO_PASSWORD),
      ])
    ).map((s) => s.cookie) as [string, string, string, string];
    const solId = (await knex("users").where({ email: DEMO_USERS.reviewers[0].email }).first("id"))
      .id;
    solCredential = (await knex("credentials").where({ reviewer_id: solId }).first("id")).id;
  });
  afterAll(async () => {
    await truncateAll(knex);
    await knex.destroy();
  });

  const storedKeys = async () => {
    const res = await fetch(`${uploadUrl}/v6/listFiles`, {
      method: "POST",
      headers: { "x-uploadthing-api-key": LOCAL_UPLOAD_KEYS.apiKey },
      body: "{}",
    });
    return ((await res.json()) as { files: { key: string }[] }).files.map((f) => f.key);
  };

  it("accepts a PDF and an image, records them, and serves them only to the reviewer and admins", async () => {
    const pdf = await uploadViaApp(
      baseUrl,
      sol,
      "credentialEvidence",
      { credentialId: solCredential },
      { name: "insurance.pdf", type: "application/pdf", bytes: tinyPdf() },
    );
    expect(pdf.putStatus).toBe(200);
    expect(pdf.putBody?.serverData?.ok).toBe(true);
    const attachmentId = pdf.putBody!.serverData!.attachmentId!;
    const row = await knex("attachments").where({ id: attachmentId }).first();
    expect(row).toMatchObject({
      purpose: "credential_evidence",
      mime_type: "application/pdf",
      file_name: "insurance.pdf",
    });
    expect(
      (await knex("credentials").where({ id: solCredential }).first("evidence_attachment_id"))
        .evidence_attachment_id,
    ).toBe(attachmentId);

    const asOwner = await fetch(`${baseUrl}/api/files/${attachmentId}`, {
      headers: { cookie: sol },
    });
    expect(asOwner.status).toBe(200);
    expect(asOwner.headers.get("content-type")).toBe("application/pdf");
    expect(
      Buffer.from(await asOwner.arrayBuffer())
        .subarray(0, 5)
        .toString(),
    ).toBe("%PDF-");
    expect(
      (await fetch(`${baseUrl}/api/files/${attachmentId}`, { headers: { cookie: admin } })).status,
    ).toBe(200);
    expect(
      (await fetch(`${baseUrl}/api/files/${attachmentId}`, { headers: { cookie: ines } })).status,
    ).toBe(403);
    expect(
      (await fetch(`${baseUrl}/api/files/${attachmentId}`, { headers: { cookie: home } })).status,
    ).toBe(403);
    expect((await fetch(`${baseUrl}/api/files/${attachmentId}`)).status).toBe(401);
    // The store itself is not public: no API key, no file.
    expect((await fetch(`${uploadUrl}/f/${row.file_key}`)).status).toBe(403);

    const png = await uploadViaApp(
      baseUrl,
      sol,
      "credentialEvidence",
      { credentialId: solCredential },
      { name: "card.png", type: "image/png", bytes: tinyPng() },
    );
    expect(png.putBody?.serverData?.ok).toBe(true);
    // The replaced document is retired.
    expect(
      (await knex("attachments").where({ id: attachmentId }).first("deleted_at")).deleted_at,
    ).not.toBeNull();
  });

  it("rejects a renamed executable by its content and keeps nothing of it", async () => {
    const before = await storedKeys();
    const r = await uploadViaApp(
      baseUrl,
      sol,
      "credentialEvidence",
      { credentialId: solCredential },
      { name: "certificate.pdf", type: "application/pdf", bytes: elfBytes() },
    );
    expect(r.putStatus).toBe(200);
    expect(r.putBody?.serverData).toMatchObject({
      ok: false,
      error: expect.stringMatching(/not a PDF or an image/),
    });
    expect(await storedKeys()).toEqual(before);
    expect(await knex("attachments").where({ file_name: "certificate.pdf" })).toHaveLength(0);
  });

  it("refuses an oversized file before anything is uploaded", async () => {
    const r = await uploadViaApp(
      baseUrl,
      sol,
      "credentialEvidence",
      { credentialId: solCredential },
      {
        name: "huge.pdf",
        type: "application/pdf",
        bytes: tinyPdf(),
        declaredSize: 9 * 1024 * 1024,
      },
    );
    expect(r.presignStatus).toBe(400);
    expect(JSON.stringify(r.presignBody)).toMatch(/FileSizeMismatch|size/i);
  });

  it("refuses evidence for another reviewer's credential, or from someone signed out, at the middleware", async () => {
    const other = await uploadViaApp(
      baseUrl,
      ines,
      "credentialEvidence",
      { credentialId: solCredential },
      { name: "x.pdf", type: "application/pdf", bytes: tinyPdf() },
    );
    expect(other.presignStatus).toBe(403);
    const homeowner = await uploadViaApp(
      baseUrl,
      home,
      "credentialEvidence",
      { credentialId: solCredential },
      { name: "x.pdf", type: "application/pdf", bytes: tinyPdf() },
    );
    expect(homeowner.presignStatus).toBe(403);
    const anon = await uploadViaApp(
      baseUrl,
      "",
      "credentialEvidence",
      { credentialId: solCredential },
      { name: "x.pdf", type: "application/pdf", bytes: tinyPdf() },
    );
    expect(anon.presignStatus).toBe(403);
  });

  it("refuses one photo too many for a project, with a clear message, before anything is stored", async () => {
    const ownerId = (
      await knex("users").where({ email: DEMO_USERS.homeowners[0].email }).first("id")
    ).id;
    const project = await knex("projects").where({ owner_id: ownerId }).first("id");
    const rows = Array.from({ length: 20 }, (_, i) => ({
      owner_id: ownerId,
      project_id: project.id,
      purpose: "photo",
      file_key: `LIMITKEY${String(i).padStart(4, "0")}`,
      file_name: `p${i}.png`,
      mime_type: "image/png",
      size_bytes: 10,
    }));
    await knex("attachments").insert(rows);
    const r = await uploadViaApp(
      baseUrl,
      home,
      "photo",
      { projectId: project.id, tag: "roof" },
      { name: "one-more.png", type: "image/png", bytes: tinyPng() },
    );
    expect(r.presignStatus).toBe(400);
    expect(JSON.stringify(r.presignBody)).toMatch(/at most 20 photos/);
    // The owner of another project cannot add photos to this one.
    const other = await signInHttp(baseUrl, DEMO_USERS.homeowners[1].email, DEMO_PASSWORD);
    const foreign = await uploadViaApp(
      baseUrl,
      other.cookie,
      "photo",
      { projectId: project.id },
      { name: "x.png", type: "image/png", bytes: tinyPng() },
    );
    expect(foreign.presignStatus).toBe(403);
  });

  it("refuses a tampered presigned URL", async () => {
    const res = await fetch(
      `${baseUrl}/api/uploadthing?actionType=upload&slug=credentialEvidence`,
      {
        method: "POST",
        headers: {
          "content-type": "application/json",
          cookie: sol,
          "x-uploadthing-package": "@uploadthing/react",
          "x-uploadthing-version": "7.7.4",
        },
        body: JSON.stringify({
          files: [{ name: "a.pdf", size: 100, type: "application/pdf" }],
          input: { credentialId: solCredential },
        }),
      },
    );
    const [{ url }] = (await res.json()) as [{ url: string }];
    const tampered = url.replace("x-ut-file-size=100", "x-ut-file-size=99999999");
    expect((await fetch(tampered, { method: "HEAD" })).status).toBe(403);
  });
});
