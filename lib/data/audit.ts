import type { Db } from "./db";

export type AuditEntity =
  | "user"
  | "reviewer"
  | "credential"
  | "project"
  | "request"
  | "quote"
  | "job"
  | "report"
  | "dispute"
  | "attachment";

/**
 * One audit row, written in the caller's transaction so the change and its record stand or fall
 * together. `actorId` null means the system (the worker, a webhook).
 */
export async function audit(
  trx: Db,
  actorId: number | null,
  action: string,
  entity: AuditEntity,
  entityId: number,
  detail: Record<string, unknown> = {},
): Promise<void> {
  await trx("audit_log").insert({
    actor_id: actorId,
    action,
    entity_type: entity,
    entity_id: entityId,
    detail: JSON.stringify(detail),
  });
}

/** Several audit rows at once (a batch of credentials expiring, say). */
export async function auditMany(
  trx: Db,
  rows: {
    actorId: number | null;
    action: string;
    entity: AuditEntity;
    entityId: number;
    detail?: Record<string, unknown>;
  }[],
): Promise<void> {
  if (rows.length === 0) return;
  await trx("audit_log").insert(
    rows.map((r) => ({
      actor_id: r.actorId,
      action: r.action,
      entity_type: r.entity,
      entity_id: r.entityId,
      detail: JSON.stringify(r.detail ?? {}),
    })),
  );
}
