import "server-only";
import type { Knex } from "knex";
import type { Level } from "@/lib/calc/findings";

export interface ProjectSummary {
  id: number;
  title: string;
  status: string;
  worstLevel: Level | null;
  openRequests: number;
  updatedAt: string;
}

export async function listOwnProjects(knex: Knex, ownerId: number): Promise<ProjectSummary[]> {
  const rows = await knex("projects as p")
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
      knex.raw("COUNT(r.id) as open_requests"),
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

export async function getAdminCounts(knex: Knex) {
  const count = async (q: Knex.QueryBuilder) =>
    Number(((await q.count({ n: "*" })) as [{ n: number }])[0].n);
  const [pendingCredentials, failedEmails, openDisputes, suspended] = await Promise.all([
    count(knex("credentials").where({ status: "pending" })),
    count(knex("email_outbox").where({ status: "failed" })),
    count(knex("disputes").where({ status: "open" })),
    count(knex("reviewer_profiles").whereNotNull("suspended_at")),
  ]);
  return { pendingCredentials, failedEmails, openDisputes, suspended };
}
