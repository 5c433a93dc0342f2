import type { Metadata } from "next";
import { pageUser } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { isVerifiedReviewer } from "@/lib/server/reviewers";
import { regionName } from "@/lib/regions";
import { formatMoney } from "@/lib/money";
import { Card } from "@/components/ui/card";
import { Forbidden } from "@/components/ui/forbidden";

export const metadata: Metadata = { title: "Request board" };

// The first cut of the board: open requests, newest first, no homeowner details. Filters,
// cursor paging and quoting arrive with the board and quotes work.
export default async function BoardPage() {
  const user = await pageUser("/board", ["reviewer"]);
  if (!user) return <Forbidden />;
  if (!(await isVerifiedReviewer(db(), user.id))) {
    return (
      <Forbidden message="The board opens once your profile is complete and your required credentials are verified and current." />
    );
  }
  const rows = await db()("requests")
    .where({ status: "open" })
    .orderBy([
      { column: "created_at", order: "desc" },
      { column: "id", order: "desc" },
    ])
    .limit(20)
    .select(
      "id",
      "kind",
      "region",
      "collector_type",
      "budget_min_minor",
      "budget_max_minor",
      "currency",
      "created_at",
    );
  return (
    <div className="space-y-4">
      <h1 className="text-3xl font-bold">Request board</h1>
      <Card>
        <ul className="divide-y divide-slate-100">
          {rows.map((r) => (
            <li key={r.id} className="flex flex-wrap gap-3 py-3">
              <span className="font-semibold">
                {r.kind === "site_visit" ? "Site visit" : "Remote design check"}
              </span>
              <span>{regionName(r.region)}</span>
              <span>{r.collector_type === "evacuated_tube" ? "evacuated tube" : "flat plate"}</span>
              <span>
                {formatMoney(r.budget_min_minor, r.currency)}–
                {formatMoney(r.budget_max_minor, r.currency)}
              </span>
              <span className="text-sm text-slate-600">
                posted {String(r.created_at).slice(0, 10)}
              </span>
            </li>
          ))}
        </ul>
      </Card>
    </div>
  );
}
