import "server-only";
import type { Knex } from "knex";
import { z } from "zod";
import { REQUIRED_CREDENTIAL_KINDS } from "@/lib/credentials";
import { notifyCredentialRejected, notifyCredentialVerified } from "@/lib/mail/notify";
import {
  credentialDecisionSchema,
  credentialSchema,
  reviewerProfileSchema,
  suspensionSchema,
  type CredentialDecisionInput,
  type CredentialInput,
  type ReviewerProfileInput,
} from "@/lib/validation/reviewer";
import { forbidden, notFound, unprocessable } from "./errors";
import type { Role } from "./accounts";

export interface Actor {
  id: number;
  role: Role;
}

const today = (now = new Date()) => now.toISOString().slice(0, 10);
const sqlNow = () => new Date().toISOString().slice(0, 23).replace("T", " ");

function invalid(error: z.ZodError): never {
  throw unprocessable(
    "Some details need attention.",
    z.flattenError(error).fieldErrors as Record<string, string[]>,
  );
}

export interface VerificationStatus {
  verified: boolean;
  suspended: boolean;
  hasProfile: boolean;
  /** Required kinds with no verified, unexpired credential. */
  missing: string[];
}

/**
 * The verified rule: a profile, not suspended, and every required credential kind verified
 * and unexpired today.
 */
export async function getVerificationStatus(
  knex: Knex,
  reviewerId: number,
  now = new Date(),
): Promise<VerificationStatus> {
  const [profile, creds] = await Promise.all([
    knex("reviewer_profiles").where({ user_id: reviewerId }).first("suspended_at"),
    knex("credentials")
      .where({ reviewer_id: reviewerId, status: "verified" })
      .andWhere("expires_on", ">=", today(now))
      .distinct("kind"),
  ]);
  const have = new Set(creds.map((c) => c.kind as string));
  const missing = REQUIRED_CREDENTIAL_KINDS.filter((k) => !have.has(k));
  const suspended = Boolean(profile?.suspended_at);
  return {
    verified: Boolean(profile) && !suspended && missing.length === 0,
    suspended,
    hasProfile: Boolean(profile),
    missing,
  };
}

export async function isVerifiedReviewer(
  knex: Knex,
  reviewerId: number,
  now = new Date(),
): Promise<boolean> {
  return (await getVerificationStatus(knex, reviewerId, now)).verified;
}

export async function saveReviewerProfile(
  knex: Knex,
  actor: Actor,
  input: ReviewerProfileInput,
): Promise<void> {
  if (actor.role !== "reviewer") throw forbidden();
  const parsed = reviewerProfileSchema.safeParse(input);
  if (!parsed.success) invalid(parsed.error);
  const v = parsed.data;
  const row = {
    trading_name: v.tradingName,
    bio: v.bio,
    years_in_trade: v.yearsInTrade,
    specialisms: JSON.stringify(v.specialisms),
    region: v.region,
    centre_lat: v.centreLat ?? null,
    centre_lng: v.centreLng ?? null,
    travel_radius_km: v.travelRadiusKm ?? null,
    hourly_rate_minor:
      v.hourlyRatePounds === undefined ? null : Math.round(v.hourlyRatePounds * 100),
  };
  await knex("reviewer_profiles")
    .insert({ user_id: actor.id, ...row })
    .onConflict("user_id")
    .merge();
}

export interface ReviewerProfile {
  userId: number;
  displayName: string;
  tradingName: string;
  bio: string;
  yearsInTrade: number;
  specialisms: string[];
  region: string;
  centreLat: number | null;
  centreLng: number | null;
  travelRadiusKm: number | null;
  hourlyRateMinor: number | null;
  suspendedAt: string | null;
  suspendedReason: string | null;
}

export async function getReviewerProfile(
  knex: Knex,
  reviewerId: number,
): Promise<ReviewerProfile | null> {
  const r = await knex("reviewer_profiles as p")
    .join("users as u", "u.id", "p.user_id")
    .where("p.user_id", reviewerId)
    .first("p.*", "u.display_name");
  if (!r) return null;
  return {
    userId: Number(r.user_id),
    displayName: r.display_name,
    tradingName: r.trading_name,
    bio: r.bio,
    yearsInTrade: r.years_in_trade,
    specialisms: typeof r.specialisms === "string" ? JSON.parse(r.specialisms) : r.specialisms,
    region: r.region,
    centreLat: r.centre_lat === null ? null : Number(r.centre_lat),
    centreLng: r.centre_lng === null ? null : Number(r.centre_lng),
    travelRadiusKm: r.travel_radius_km,
    hourlyRateMinor: r.hourly_rate_minor,
    suspendedAt: r.suspended_at,
    suspendedReason: r.suspended_reason,
  };
}

export interface Credential {
  id: number;
  reviewerId: number;
  kind: string;
  issuer: string;
  number: string;
  expiresOn: string;
  status: "pending" | "verified" | "rejected" | "expired";
  adminReason: string | null;
  evidenceAttachmentId: number | null;
  createdAt: string;
  reviewedAt: string | null;
}

const CREDENTIAL_COLUMNS = [
  "id",
  "reviewer_id",
  "kind",
  "issuer",
  "number",
  "expires_on",
  "status",
  "admin_reason",
  "evidence_attachment_id",
  "created_at",
  "reviewed_at",
];

function toCredential(r: Record<string, unknown>): Credential {
  return {
    id: Number(r.id),
    reviewerId: Number(r.reviewer_id),
    kind: String(r.kind),
    issuer: String(r.issuer),
    number: String(r.number),
    expiresOn: String(r.expires_on),
    status: r.status as Credential["status"],
    adminReason: (r.admin_reason as string | null) ?? null,
    evidenceAttachmentId:
      r.evidence_attachment_id === null ? null : Number(r.evidence_attachment_id),
    createdAt: String(r.created_at),
    reviewedAt: (r.reviewed_at as string | null) ?? null,
  };
}

export async function listOwnCredentials(knex: Knex, actor: Actor): Promise<Credential[]> {
  if (actor.role !== "reviewer") throw forbidden();
  const rows = await knex("credentials")
    .where({ reviewer_id: actor.id })
    .orderBy("created_at", "desc")
    .select(CREDENTIAL_COLUMNS);
  return rows.map(toCredential);
}

/** One credential: its reviewer or an admin; anyone else gets 403 (404 when it does not exist). */
export async function getCredential(knex: Knex, actor: Actor, id: number): Promise<Credential> {
  const row = await knex("credentials").where({ id }).first(CREDENTIAL_COLUMNS);
  if (!row) throw notFound("No such credential.");
  if (
    actor.role !== "admin" &&
    !(actor.role === "reviewer" && Number(row.reviewer_id) === actor.id)
  )
    throw forbidden();
  return toCredential(row);
}

export async function addCredential(
  knex: Knex,
  actor: Actor,
  input: CredentialInput,
): Promise<number> {
  if (actor.role !== "reviewer") throw forbidden();
  const parsed = credentialSchema.safeParse(input);
  if (!parsed.success) invalid(parsed.error);
  const v = parsed.data;
  if (v.expiresOn < today())
    throw unprocessable("Some details need attention.", {
      expiresOn: ["This credential has already expired"],
    });
  return knex.transaction(async (trx) => {
    const [id] = await trx("credentials").insert({
      reviewer_id: actor.id,
      kind: v.kind,
      issuer: v.issuer,
      number: v.number,
      expires_on: v.expiresOn,
      status: "pending",
    });
    await trx("audit_log").insert({
      actor_id: actor.id,
      action: "credential.submitted",
      entity_type: "credential",
      entity_id: id,
      detail: JSON.stringify({ kind: v.kind }),
    });
    return Number(id);
  });
}

/** Admin: verify (with the expiry date read off the evidence) or reject (with a reason). */
export async function decideCredential(
  knex: Knex,
  actor: Actor,
  input: CredentialDecisionInput,
  appUrl: string,
): Promise<void> {
  if (actor.role !== "admin") throw forbidden();
  const parsed = credentialDecisionSchema.safeParse(input);
  if (!parsed.success) invalid(parsed.error);
  const v = parsed.data;
  await knex.transaction(async (trx) => {
    const row = await trx("credentials")
      .where({ id: v.credentialId })
      .forUpdate()
      .first("id", "reviewer_id", "status");
    if (!row) throw notFound("No such credential.");
    const reviewedAt = sqlNow();
    if (v.decision === "verify") {
      const status = v.expiresOn < today() ? "expired" : "verified";
      await trx("credentials").where({ id: v.credentialId }).update({
        status,
        expires_on: v.expiresOn,
        admin_reason: null,
        reviewed_by: actor.id,
        reviewed_at: reviewedAt,
        expiry_warned_at: null,
      });
      await trx("audit_log").insert({
        actor_id: actor.id,
        action: "credential.verified",
        entity_type: "reviewer",
        entity_id: row.reviewer_id,
        detail: JSON.stringify({ credentialId: row.id, from: row.status, expiresOn: v.expiresOn }),
      });
      if (status === "verified") await notifyCredentialVerified(trx, appUrl, row.id);
    } else {
      await trx("credentials").where({ id: v.credentialId }).update({
        status: "rejected",
        admin_reason: v.reason,
        reviewed_by: actor.id,
        reviewed_at: reviewedAt,
      });
      await trx("audit_log").insert({
        actor_id: actor.id,
        action: "credential.rejected",
        entity_type: "reviewer",
        entity_id: row.reviewer_id,
        detail: JSON.stringify({ credentialId: row.id, from: row.status, reason: v.reason }),
      });
      await notifyCredentialRejected(trx, appUrl, row.id);
    }
  });
}

export async function setSuspension(
  knex: Knex,
  actor: Actor,
  input: z.input<typeof suspensionSchema>,
): Promise<void> {
  if (actor.role !== "admin") throw forbidden();
  const parsed = suspensionSchema.safeParse(input);
  if (!parsed.success) invalid(parsed.error);
  const v = parsed.data;
  await knex.transaction(async (trx) => {
    const p = await trx("reviewer_profiles")
      .where({ user_id: v.reviewerId })
      .forUpdate()
      .first("user_id");
    if (!p) throw notFound("No such reviewer profile.");
    await trx("reviewer_profiles")
      .where({ user_id: v.reviewerId })
      .update(
        v.suspend
          ? { suspended_at: sqlNow(), suspended_reason: v.reason }
          : { suspended_at: null, suspended_reason: null },
      );
    await trx("audit_log").insert({
      actor_id: actor.id,
      action: v.suspend ? "reviewer.suspended" : "reviewer.reinstated",
      entity_type: "reviewer",
      entity_id: v.reviewerId,
      detail: JSON.stringify({ reason: v.reason }),
    });
  });
}

export const QUEUE_SORTS = ["created_at", "expires_on", "kind", "status"] as const;
export const queueQuerySchema = z.object({
  status: z.enum(["pending", "verified", "rejected", "expired", "all"]).default("pending"),
  kind: z.string().max(64).optional(),
  q: z.string().trim().max(100).optional(),
  sort: z.enum(QUEUE_SORTS).default("created_at"),
  dir: z.enum(["asc", "desc"]).default("asc"),
  page: z.coerce.number().int().min(1).max(10_000).default(1),
});
export type QueueQuery = z.output<typeof queueQuerySchema>;
export const QUEUE_PAGE_SIZE = 20;

export interface QueueRow extends Credential {
  reviewerName: string;
  tradingName: string | null;
  reviewerEmail: string;
}

/** Admin: the credential verification queue, filtered, sorted and paginated. */
export async function listCredentialQueue(
  knex: Knex,
  actor: Actor,
  query: QueueQuery,
): Promise<{ rows: QueueRow[]; total: number }> {
  if (actor.role !== "admin") throw forbidden();
  const base = knex("credentials as c")
    .join("users as u", "u.id", "c.reviewer_id")
    .leftJoin("reviewer_profiles as p", "p.user_id", "c.reviewer_id")
    .modify((q) => {
      if (query.status !== "all") q.where("c.status", query.status);
      if (query.kind) q.where("c.kind", query.kind);
      if (query.q)
        q.where((w) =>
          w
            .whereILike("u.display_name", `%${query.q}%`)
            .orWhereILike("p.trading_name", `%${query.q}%`)
            .orWhereILike("c.number", `%${query.q}%`),
        );
    });
  const [{ n }] = (await base.clone().count({ n: "*" })) as [{ n: number }];
  const rows = await base
    .clone()
    .orderBy(`c.${query.sort}`, query.dir)
    .orderBy("c.id", query.dir)
    .limit(QUEUE_PAGE_SIZE)
    .offset((query.page - 1) * QUEUE_PAGE_SIZE)
    .select(
      CREDENTIAL_COLUMNS.map((c) => `c.${c}`).concat([
        "u.display_name",
        "u.email",
        "p.trading_name",
      ]),
    );
  return {
    total: Number(n),
    rows: rows.map((r: Record<string, string | null>) => ({
      ...toCredential(r),
      reviewerName: String(r.display_name),
      tradingName: r.trading_name ?? null,
      reviewerEmail: String(r.email),
    })),
  };
}

export interface AuditEntry {
  id: number;
  action: string;
  actorName: string | null;
  detail: Record<string, unknown>;
  createdAt: string;
}

export async function listReviewerAudit(
  knex: Knex,
  actor: Actor,
  reviewerId: number,
): Promise<AuditEntry[]> {
  if (actor.role !== "admin") throw forbidden();
  const rows = await knex("audit_log as a")
    .leftJoin("users as u", "u.id", "a.actor_id")
    .where((w) =>
      w
        .where({ "a.entity_type": "reviewer", "a.entity_id": reviewerId })
        .orWhere((x) => x.where({ "a.entity_type": "user", "a.entity_id": reviewerId })),
    )
    .orderBy("a.id", "desc")
    .limit(100)
    .select("a.id", "a.action", "a.detail", "a.created_at", "u.display_name");
  return rows.map((r) => ({
    id: Number(r.id),
    action: r.action,
    actorName: r.display_name ?? null,
    detail: typeof r.detail === "string" ? JSON.parse(r.detail) : r.detail,
    createdAt: r.created_at,
  }));
}
