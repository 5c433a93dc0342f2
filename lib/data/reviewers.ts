import { z } from "zod";
import { REQUIRED_CREDENTIAL_KINDS } from "@/lib/credentials";
import { sqlDate, sqlDateTime } from "@/lib/time";
import type { Actor } from "./actor";
import { audit, auditMany } from "./audit";
import { endSessions } from "./accounts";
import type { Db } from "./db";
import {
  notifyCredentialExpiring,
  notifyCredentialRejected,
  notifyCredentialVerified,
} from "./notify";
import {
  credentialDecisionSchema,
  credentialSchema,
  reviewerProfileSchema,
  suspensionSchema,
} from "@/lib/validation/reviewer";
import { forbidden, notFound, parseInput, unprocessable } from "./errors";
import type { ReviewerProfile } from "@/lib/types/reviewers";

export type { ReviewerProfile } from "@/lib/types/reviewers";

export type { Actor } from "./actor";

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
  db: Db,
  reviewerId: number,
  now = new Date(),
): Promise<VerificationStatus> {
  const [profile, creds] = await Promise.all([
    db("reviewer_profiles").where({ user_id: reviewerId }).first("suspended_at"),
    db("credentials")
      .where({ reviewer_id: reviewerId, status: "verified" })
      .andWhere("expires_on", ">=", sqlDate(now))
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

/** What the board needs to know about the reviewer asking: read in one round trip. */
export interface BoardReviewer {
  verified: boolean;
  /** users.session_version: a session token with an older one has been ended. */
  sessionVersion: number;
  centre: { lat: number; lng: number } | null;
}

/**
 * The verified rule of getVerificationStatus (a profile, not suspended, every required kind
 * verified and unexpired today) and the centre point, in one query, for the board's JSON route;
 * null when the user is gone. A user who is no longer a reviewer is not verified.
 */
export async function getBoardReviewer(
  db: Db,
  reviewerId: number,
  now = new Date(),
): Promise<BoardReviewer | null> {
  const row = await db("users as u")
    .leftJoin("reviewer_profiles as rp", "rp.user_id", "u.id")
    .where("u.id", reviewerId)
    .first(
      "u.role",
      "u.session_version",
      "rp.user_id as profile",
      "rp.suspended_at",
      "rp.centre_lat",
      "rp.centre_lng",
      db("credentials as c")
        .countDistinct("c.kind")
        .whereRaw("c.reviewer_id = u.id")
        .andWhere("c.status", "verified")
        .andWhere("c.expires_on", ">=", sqlDate(now))
        .whereIn("c.kind", REQUIRED_CREDENTIAL_KINDS)
        .as("kinds"),
    );
  if (!row) return null;
  return {
    verified:
      row.role === "reviewer" &&
      row.profile !== null &&
      row.suspended_at === null &&
      Number(row.kinds) === REQUIRED_CREDENTIAL_KINDS.length,
    sessionVersion: Number(row.session_version ?? 0),
    centre:
      row.centre_lat != null && row.centre_lng != null
        ? { lat: Number(row.centre_lat), lng: Number(row.centre_lng) }
        : null,
  };
}

export async function isVerifiedReviewer(
  db: Db,
  reviewerId: number,
  now = new Date(),
): Promise<boolean> {
  return (await getVerificationStatus(db, reviewerId, now)).verified;
}

export async function saveReviewerProfile(db: Db, actor: Actor, input: unknown): Promise<void> {
  if (actor.role !== "reviewer") throw forbidden();
  const v = parseInput(reviewerProfileSchema, input);
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
  await db("reviewer_profiles")
    .insert({ user_id: actor.id, ...row })
    .onConflict("user_id")
    .merge();
}

/**
 * A reviewer's profile: the reviewer themself and admins always; anyone (signed in or not) only
 * while the reviewer is not suspended, as the public profile page shows it.
 */
export async function getReviewerProfile(
  db: Db,
  actor: Actor | null,
  reviewerId: number,
): Promise<ReviewerProfile | null> {
  const r = await db("reviewer_profiles as p")
    .join("users as u", "u.id", "p.user_id")
    .where("p.user_id", reviewerId)
    .first("p.*", "u.display_name");
  if (!r) return null;
  const privileged = actor && (actor.role === "admin" || actor.id === reviewerId);
  if (!privileged && r.suspended_at) return null;
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

export async function listOwnCredentials(db: Db, actor: Actor): Promise<Credential[]> {
  if (actor.role !== "reviewer") throw forbidden();
  const rows = await db("credentials")
    .where({ reviewer_id: actor.id })
    .orderBy("created_at", "desc")
    .select(CREDENTIAL_COLUMNS);
  return rows.map(toCredential);
}

/** One credential: its reviewer or an admin; anyone else gets 403 (404 when it does not exist). */
export async function getCredential(db: Db, actor: Actor, id: number): Promise<Credential> {
  const row = await db("credentials").where({ id }).first(CREDENTIAL_COLUMNS);
  if (!row) throw notFound("No such credential.");
  if (
    actor.role !== "admin" &&
    !(actor.role === "reviewer" && Number(row.reviewer_id) === actor.id)
  )
    throw forbidden();
  return toCredential(row);
}

export async function addCredential(db: Db, actor: Actor, input: unknown): Promise<number> {
  if (actor.role !== "reviewer") throw forbidden();
  const v = parseInput(credentialSchema, input);
  if (v.expiresOn < sqlDate())
    throw unprocessable("Some details need attention.", {
      expiresOn: ["This credential has already expired"],
    });
  return db.transaction(async (trx) => {
    const [id] = await trx("credentials").insert({
      reviewer_id: actor.id,
      kind: v.kind,
      issuer: v.issuer,
      number: v.number,
      expires_on: v.expiresOn,
      status: "pending",
    });
    await audit(trx, actor.id, "credential.submitted", "credential", Number(id), { kind: v.kind });
    return Number(id);
  });
}

/** Admin: verify (with the expiry date read off the evidence) or reject (with a reason). */
export async function decideCredential(
  db: Db,
  actor: Actor,
  input: unknown,
  appUrl: string,
): Promise<void> {
  if (actor.role !== "admin") throw forbidden();
  const v = parseInput(credentialDecisionSchema, input);
  await db.transaction(async (trx) => {
    const row = await trx("credentials")
      .where({ id: v.credentialId })
      .forUpdate()
      .first("id", "reviewer_id", "status");
    if (!row) throw notFound("No such credential.");
    const reviewedAt = sqlDateTime();
    if (v.decision === "verify") {
      const status = v.expiresOn < sqlDate() ? "expired" : "verified";
      await trx("credentials").where({ id: v.credentialId }).update({
        status,
        expires_on: v.expiresOn,
        admin_reason: null,
        reviewed_by: actor.id,
        reviewed_at: reviewedAt,
        expiry_warned_at: null,
      });
      await audit(trx, actor.id, "credential.verified", "reviewer", Number(row.reviewer_id), {
        credentialId: Number(row.id),
        from: row.status,
        expiresOn: v.expiresOn,
      });
      if (status === "verified") await notifyCredentialVerified(trx, appUrl, row.id);
    } else {
      await trx("credentials").where({ id: v.credentialId }).update({
        status: "rejected",
        admin_reason: v.reason,
        reviewed_by: actor.id,
        reviewed_at: reviewedAt,
      });
      await audit(trx, actor.id, "credential.rejected", "reviewer", Number(row.reviewer_id), {
        credentialId: Number(row.id),
        from: row.status,
        reason: v.reason,
      });
      await notifyCredentialRejected(trx, appUrl, row.id);
    }
  });
}

export async function setSuspension(db: Db, actor: Actor, input: unknown): Promise<void> {
  if (actor.role !== "admin") throw forbidden();
  const v = parseInput(suspensionSchema, input);
  await db.transaction(async (trx) => {
    const p = await trx("reviewer_profiles")
      .where({ user_id: v.reviewerId })
      .forUpdate()
      .first("user_id");
    if (!p) throw notFound("No such reviewer profile.");
    await trx("reviewer_profiles")
      .where({ user_id: v.reviewerId })
      .update(
        v.suspend
          ? { suspended_at: sqlDateTime(), suspended_reason: v.reason }
          : { suspended_at: null, suspended_reason: null },
      );
    // A suspended reviewer's sessions end now, on every device.
    if (v.suspend) await endSessions(trx, v.reviewerId);
    await audit(
      trx,
      actor.id,
      v.suspend ? "reviewer.suspended" : "reviewer.reinstated",
      "reviewer",
      v.reviewerId,
      { reason: v.reason },
    );
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
  db: Db,
  actor: Actor,
  query: QueueQuery,
): Promise<{ rows: QueueRow[]; total: number }> {
  if (actor.role !== "admin") throw forbidden();
  const base = db("credentials as c")
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
  db: Db,
  actor: Actor,
  reviewerId: number,
): Promise<AuditEntry[]> {
  if (actor.role !== "admin") throw forbidden();
  const rows = await db("audit_log as a")
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

export interface ReviewerAccount {
  id: number;
  displayName: string;
  email: string;
  createdAt: string;
}

/** Admin: a reviewer's account and every credential they have submitted, newest first. */
export async function getReviewerRecord(
  db: Db,
  actor: Actor,
  reviewerId: number,
): Promise<{ account: ReviewerAccount; credentials: Credential[] } | null> {
  if (actor.role !== "admin") throw forbidden();
  const account = await db("users")
    .where({ id: reviewerId, role: "reviewer" })
    .first("id", "display_name", "email", "created_at");
  if (!account) return null;
  const rows = await db("credentials")
    .where({ reviewer_id: reviewerId })
    .orderBy("created_at", "desc")
    .select(CREDENTIAL_COLUMNS);
  return {
    account: {
      id: Number(account.id),
      displayName: account.display_name,
      email: account.email,
      createdAt: String(account.created_at),
    },
    credentials: rows.map(toCredential),
  };
}

/** The credential kinds a reviewer holds verified and unexpired today: the public badges. */
export async function listVerifiedKinds(
  db: Db,
  reviewerId: number,
  now = new Date(),
): Promise<string[]> {
  const rows = await db("credentials")
    .where({ reviewer_id: reviewerId, status: "verified" })
    .andWhere("expires_on", ">=", sqlDate(now))
    .distinct("kind");
  return rows.map((r) => String(r.kind));
}

/**
 * The daily expiry pass, run by the worker as the system: verified credentials whose date has
 * passed become `expired` (audited). Returns how many.
 */
export async function expireCredentials(db: Db, now = new Date()): Promise<number> {
  const today = sqlDate(now);
  return db.transaction(async (trx) => {
    const rows = await trx("credentials")
      .where({ status: "verified" })
      .andWhere("expires_on", "<", today)
      .forUpdate()
      .select("id", "reviewer_id");
    if (rows.length === 0) return 0;
    await trx("credentials")
      .whereIn(
        "id",
        rows.map((r) => r.id),
      )
      .update({ status: "expired" });
    await auditMany(
      trx,
      rows.map((r) => ({
        actorId: null,
        action: "credential.expired",
        entity: "credential" as const,
        entityId: Number(r.id),
        detail: { on: today },
      })),
    );
    return rows.length;
  });
}

/**
 * Warn once about each verified credential that expires within `days` days: one e-mail per
 * credential and date (deduplicated), queued in the same transaction that marks it warned.
 * Returns how many warnings were queued.
 */
export async function warnExpiringCredentials(
  db: Db,
  appUrl: string,
  now = new Date(),
  days = 30,
): Promise<number> {
  const today = sqlDate(now);
  const horizon = sqlDate(now, days * 86_400_000);
  const soon = await db("credentials")
    .where("status", "verified")
    .andWhere("expires_on", ">=", today)
    .andWhere("expires_on", "<=", horizon)
    .whereNull("expiry_warned_at")
    .select("id");
  let warned = 0;
  for (const c of soon) {
    await db.transaction(async (trx) => {
      const queued = await notifyCredentialExpiring(trx, appUrl, Number(c.id));
      await trx("credentials")
        .where({ id: c.id })
        .update({ expiry_warned_at: sqlDateTime(now) });
      if (queued) warned += 1;
    });
  }
  return warned;
}
