import { env } from "@/lib/env";
import type { Metadata } from "next";
import Link from "next/link";
import { pageUser } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { getReviewerProfile } from "@/lib/data/reviewers";
import { Card } from "@/components/ui/card";
import { ProfileForm } from "@/components/reviewer/profile-form";

export const metadata: Metadata = { title: "Your trade profile" };

export default async function ReviewerProfilePage() {
  const user = await pageUser("/reviewer/profile", ["reviewer"]);
  const profile = await getReviewerProfile(db(), user, user.id);
  return (
    <div className="space-y-4">
      <h1 className="text-3xl font-bold">Your trade profile</h1>
      <p className="text-slate-700">
        Homeowners see this when they compare quotes.{" "}
        {profile ? (
          <Link className="underline" href={`/reviewers/${user.id}`}>
            See your public profile
          </Link>
        ) : null}
      </p>
      <Card>
        <ProfileForm profile={profile} currency={env().CURRENCY} />
      </Card>
    </div>
  );
}
