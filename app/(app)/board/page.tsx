import type { Metadata } from "next";
import { Suspense } from "react";
import { pageUser } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { isVerifiedReviewer } from "@/lib/server/reviewers";
import { Forbidden } from "@/components/ui/forbidden";
import { BoardView } from "@/components/board/board-view";

export const metadata: Metadata = { title: "Request board" };

export default async function BoardPage() {
  const user = await pageUser("/board", ["reviewer"]);
  if (!user) return <Forbidden />;
  if (!(await isVerifiedReviewer(db(), user.id))) {
    return (
      <Forbidden message="The board opens once your profile is complete and your required credentials are verified and current." />
    );
  }
  return (
    <div className="space-y-4">
      <h1 className="text-3xl font-bold">Request board</h1>
      <p className="text-slate-700">
        Open requests from homeowners. Opening a request and quoting arrive next.
      </p>
      <Suspense fallback={<p role="status">Loading requests…</p>}>
        <BoardView />
      </Suspense>
    </div>
  );
}
