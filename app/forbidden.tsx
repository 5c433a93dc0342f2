import { SiteFooter, SiteHeader } from "@/components/layout/site-header";
import { ProblemPage } from "@/components/ui/problem-page";

export default function Forbidden() {
  return (
    <>
      <SiteHeader />
      <main className="mx-auto max-w-6xl px-4 py-8">
        <ProblemPage
          title="This page is not open to your account"
          message="You are signed in, but this part of Loopwright belongs to another kind of account."
          homeHref="/dashboard"
          homeLabel="Go to your dashboard"
        />
      </main>
      <SiteFooter />
    </>
  );
}
