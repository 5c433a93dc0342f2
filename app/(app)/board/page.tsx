import type { Metadata } from "next";
import { Suspense } from "react";
import { pageUser } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { isVerifiedReviewer } from "@/lib/data/reviewers";
import { ProblemPage } from "@/components/ui/problem-page";
import { BoardView } from "@/components/board/board-view";
import { PayoutNotice } from "@/components/quotes/payout-notice";
import { getPayoutAccount } from "@/lib/data/payments";
import { ratingSummary } from "@/lib/data/ratings";
import { RatingLine } from "@/components/aftercare/stars";
import Link from "next/link";
import { env } from "@/lib/env";

export const metadata: Metadata = { title: "Request board" };

export default async function BoardPage() {
  const user = await pageUser("/board", ["reviewer"]);
  if (!(await isVerifiedReviewer(db(), user.id))) {
    return (
      <ProblemPage
        title="The request board is not open to you yet"
        message="It opens once your trade profile is complete and your required credentials are verified and current."
        homeHref="/dashboard"
        homeLabel="See what is missing on your dashboard"
      />
    );
  }
  const rating = await ratingSummary(db(), user.id);
  return (
    <div className="space-y-4">
      <h1 className="text-3xl font-bold">Request board</h1>
      <p className="text-sm" data-testid="board-rating">
        Your rating, as homeowners see it beside your quotes: <RatingLine summary={rating} />{" "}
        <Link className="underline" href={`/reviewers/${user.id}`}>
          Your public profile
        </Link>
      </p>
      <p className="text-slate-700">
        Open requests from homeowners. Open one to see the description, the loop check and the
        photos, then quote or send the homeowner a question.
      </p>
      <PayoutNotice ready={(await getPayoutAccount(db(), user)).ready} />
      <Suspense fallback={<p role="status">Loading requests…</p>}>
        <BoardView currency={env().CURRENCY} />
      </Suspense>
    </div>
  );
}
