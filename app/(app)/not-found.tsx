import { ProblemPage } from "@/components/ui/problem-page";

export default function AppNotFound() {
  return (
    <ProblemPage
      title="We could not find that"
      message="It may have been removed, or it belongs to someone else."
      homeHref="/dashboard"
      homeLabel="Back to your dashboard"
    />
  );
}
