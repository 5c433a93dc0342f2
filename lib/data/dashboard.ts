import type { Knex } from "knex";
import type { Level } from "@/lib/calc/findings";
import type { Actor } from "./actor";
import type { Db } from "./db";
import { forbidden } from "./errors";

export interface ProjectSummary {
  id: number;
  title: string;
  status: string;
  worstLevel: Level | null;
  openRequests: number;
  updatedAt: string;
}

/** The homeowner's own projects, most recently changed first, with their open request count. */
export async function listOwnProjects(db: Db, actor: Actor): Promise<ProjectSummary[]> {
  if (actor.role !== "homeowner") throw forbidden("Only homeowners have projects.");
  const ownerId = actor.id;
  const rows = await db("projects as p")
    .leftJoin("requests as r", function () {
      this.on("r.project_id", "p.id").andOnVal("r.status", "open");
    })
    .where({ "p.owner_id": ownerId })
    .whereNull("p.deleted_at")
    .groupBy("p.id")
    .orderBy("p.updated_at", "desc")
    .select(
      "p.id",
      "p.title",
      "p.status",
      "p.worst_level",
      "p.updated_at",
      db.raw("COUNT(r.id) as open_requests"),
    );
  return rows.map((r) => ({
    id: Number(r.id),
    title: r.title,
    status: r.status,
    worstLevel: r.worst_level,
    openRequests: Number(r.open_requests),
    updatedAt: r.updated_at,
  }));
}

/** Admin: what waits for an admin, as counts for the dashboard tiles. */
export async function getAdminCounts(db: Db, actor: Actor) {
  if (actor.role !== "admin") throw forbidden();
  const count = async (q: Knex.QueryBuilder) =>
    Number(((await q.count({ n: "*" })) as [{ n: number }])[0].n);
  const [pendingCredentials, failedEmails, openDisputes, suspended] = await Promise.all([
    count(db("credentials").where({ status: "pending" })),
    count(db("email_outbox").where({ status: "failed" })),
    count(db("disputes").where({ status: "open" })),
    count(db("reviewer_profiles").whereNotNull("suspended_at")),
  ]);
  return { pendingCredentials, failedEmails, openDisputes, suspended };
}
