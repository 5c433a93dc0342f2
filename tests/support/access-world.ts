/**
 * The people and records the access matrix and the hostile-input tests run against: one job in
 * review with its project, a stored photo and the job's request; a second project of the same
 * homeowner with an open request the job's reviewer has quoted on; a pending credential; and one
 * signed-in session per actor (signed in through next-auth over HTTP, so the app's real session
 * checks run).
 */
import { mkdirSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import type { Knex } from "knex";
import {
  FIXTURE_PASSWORD,
  makeAdmin,
  makeHomeowner,
  makeJob,
  makeProject,
  makeQuote,
  makeRequest,
  makeReviewer,
  type AdminFixture,
  type HomeownerFixture,
  type JobFixture,
  type ProjectFixture,
  type QuoteFixture,
  type RequestFixture,
  type ReviewerFixture,
} from "./fixtures";
import { tinyPng } from "./uploads";
import { signInHttp } from "./session";
import { paymentsFakeControl } from "./payments";
import { TEST_PAYMENT_KEYS } from "./fakes";

export const ACTORS = [
  "anonymous",
  "owner",
  "otherHomeowner",
  "pendingReviewer",
  "verifiedReviewer",
  "jobReviewer",
  "suspendedReviewer",
  "admin",
] as const;
export type Actor = (typeof ACTORS)[number];

export const ACTOR_WORDS: Record<Actor, string> = {
  anonymous: "signed out",
  owner: "the owning homeowner",
  otherHomeowner: "another homeowner",
  pendingReviewer: "a pending reviewer",
  verifiedReviewer: "a verified reviewer not on the job",
  jobReviewer: "the job's reviewer",
  suspendedReviewer: "a suspended reviewer",
  admin: "an admin",
};

export interface World {
  knex: Knex;
  people: {
    owner: HomeownerFixture;
    otherHomeowner: HomeownerFixture;
    pendingReviewer: ReviewerFixture;
    verifiedReviewer: ReviewerFixture;
    jobReviewer: ReviewerFixture;
    suspendedReviewer: ReviewerFixture;
    admin: AdminFixture;
  };
  job: JobFixture;
  /** The owner's second project, with an open request quoted on by the job's reviewer. */
  project: ProjectFixture;
  openRequest: RequestFixture;
  quote: QuoteFixture;
  /** A photo on the job's project, stored in the upload fake. */
  fileId: number;
  /** A pending credential of the pending reviewer. */
  credentialId: number;
  /** Values for the `[param]`s of route patterns, by name (see `paramsFor`). */
  ids: Record<string, number | string>;
  cookies: Record<Actor, string | undefined>;
  /** The upload fake's store, for files made by action rows. */
  uploadDir: string;
}

/** Store bytes in the upload fake the way its ingest does, and record the attachment. */
export async function storeFile(
  knex: Knex,
  project: ProjectFixture,
  uploadDir: string,
): Promise<number> {
  const key = `fx${Date.now().toString(36)}${Math.random().toString(36).slice(2, 10)}`;
  const bytes = tinyPng();
  mkdirSync(uploadDir, { recursive: true });
  writeFileSync(join(uploadDir, `${key}.bin`), bytes);
  writeFileSync(
    join(uploadDir, `${key}.json`),
    JSON.stringify({
      key,
      name: "loop.png",
      size: bytes.length,
      type: "image/png",
      customId: null,
      fileHash: "",
      uploadedAt: Date.now(),
    }),
  );
  const [id] = await knex("attachments").insert({
    owner_id: project.ownerId,
    project_id: project.id,
    purpose: "photo",
    file_key: key,
    file_name: "loop.png",
    mime_type: "image/png",
    size_bytes: bytes.length,
  });
  return Number(id);
}

export async function buildWorld(
  knex: Knex,
  baseUrl: string,
  uploadDir: string,
  paymentsUrl?: string,
): Promise<World> {
  // The payment fake keeps its own state: start it afresh with the database, or its
  // idempotency keys (made from ids) would clash with the new rows' ids.
  if (paymentsUrl) await paymentsFakeControl(paymentsUrl, TEST_PAYMENT_KEYS.secretKey).reset();
  const owner = await makeHomeowner(knex);
  const otherHomeowner = await makeHomeowner(knex);
  const pendingReviewer = await makeReviewer(knex, { verified: false });
  const verifiedReviewer = await makeReviewer(knex);
  const jobReviewer = await makeReviewer(knex);
  const suspendedReviewer = await makeReviewer(knex, { suspended: true });
  const admin = await makeAdmin(knex);
  const people = {
    owner,
    otherHomeowner,
    pendingReviewer,
    verifiedReviewer,
    jobReviewer,
    suspendedReviewer,
    admin,
  };
  const job = await makeJob(knex, "in_review", { homeowner: owner, reviewer: jobReviewer });
  const fileId = await storeFile(knex, job.project, uploadDir);
  const project = await makeProject(knex, owner);
  const openRequest = await makeRequest(knex, project);
  const quote = await makeQuote(knex, openRequest, jobReviewer);
  // Quoting opens the thread between the homeowner and the reviewer.
  await knex("message_threads").insert({ request_id: openRequest.id, reviewer_id: jobReviewer.id });
  const credentialId = Number(
    (await knex("credentials").where({ reviewer_id: pendingReviewer.id }).first("id")).id,
  );
  const cookies = { anonymous: undefined } as Record<Actor, string | undefined>;
  for (const [actor, person] of Object.entries(people)) {
    const s = await signInHttp(baseUrl, person.email, FIXTURE_PASSWORD);
    if (!s.cookie.includes("session-token")) throw new Error(`${actor} could not sign in`);
    cookies[actor as Actor] = s.cookie;
  }
  return {
    knex,
    people,
    job,
    project,
    openRequest,
    quote,
    fileId,
    credentialId,
    ids: {
      job: job.id,
      jobProject: job.project.id,
      project: project.id,
      openRequest: openRequest.id,
      jobRequest: job.request.id,
      file: fileId,
      credential: credentialId,
      jobReviewer: jobReviewer.id,
      step: "site",
    },
    cookies,
    uploadDir,
  };
}

/** `/jobs/[id]` with `{ id: "job" }` → `/jobs/17`. */
export function fillPattern(
  pattern: string,
  params: Record<string, string> | undefined,
  w: World,
): string {
  return pattern.replace(/\[(?:\.\.\.)?(\w+)\]/g, (_m, name: string) => {
    const from = params?.[name];
    if (!from) throw new Error(`${pattern}: no value for [${name}] (add params to its row)`);
    const v = w.ids[from] ?? from;
    return encodeURIComponent(String(v));
  });
}

/** Checksums of every table, to show a refused call changed nothing. */
export async function tableChecksums(knex: Knex): Promise<Record<string, string>> {
  const tables = ((await knex.raw("SHOW TABLES"))[0] as Record<string, string>[])
    .map((r) => Object.values(r)[0]!)
    // The sign-in, sign-up and reset counters count attempts, refused ones too: that is their job.
    .filter((t) => !t.startsWith("knex_") && t !== "rate_limits");
  const rows = (
    await knex.raw(`CHECKSUM TABLE ${tables.map(() => "??").join(", ")}`, tables)
  )[0] as {
    Table: string;
    Checksum: string | number | null;
  }[];
  return Object.fromEntries(rows.map((r) => [r.Table.split(".").pop()!, String(r.Checksum)]));
}

/** The tables whose checksum differs. */
export function changedTables(a: Record<string, string>, b: Record<string, string>): string[] {
  return Object.keys({ ...a, ...b }).filter((t) => a[t] !== b[t]);
}
