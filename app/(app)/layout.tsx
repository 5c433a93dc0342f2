import { redirect } from "next/navigation";
import { AppHeader, navFor } from "@/components/layout/app-header";
import { SiteFooter } from "@/components/layout/site-header";
import { Providers } from "@/components/providers";
import { getCurrentUser } from "@/lib/server/auth/session";
import { isVerifiedReviewer } from "@/lib/data/reviewers";
import { db } from "@/lib/server/db";
import { countUnread } from "@/lib/data/messages";

export default async function AppLayout({ children }: { children: React.ReactNode }) {
  // The layout only draws the shell; each page checks access for itself.
  const user = await getCurrentUser();
  if (!user) redirect("/sign-in");
  const [verified, unread] = await Promise.all([
    user.role === "reviewer" ? isVerifiedReviewer(db(), user.id) : false,
    user.role === "admin" ? 0 : countUnread(db(), user),
  ]);
  return (
    <>
      <AppHeader user={user} nav={navFor(user, verified)} unread={unread} />
      <main className="mx-auto w-full max-w-6xl flex-1 px-4 py-8">
        <Providers>{children}</Providers>
      </main>
      <SiteFooter />
    </>
  );
}
