import { ProblemPage } from "@/components/ui/problem-page";

export default function AppForbidden() {
  return (
    <ProblemPage
      title="This page is not open to your account"
      message="It belongs to another kind of account, or to someone else's project."
      homeHref="/dashboard"
      homeLabel="Back to your dashboard"
    />
  );
}
