import { SiteFooter, SiteHeader } from "@/components/layout/site-header";
import { ProblemPage } from "@/components/ui/problem-page";

export default function NotFound() {
  return (
    <>
      <SiteHeader />
      <main className="mx-auto max-w-6xl px-4 py-8">
        <ProblemPage
          title="We could not find that page"
          message="The address may be mistyped, or what it pointed to has been removed."
        />
      </main>
      <SiteFooter />
    </>
  );
}
