import { ProblemPage } from "@/components/ui/problem-page";

export default function PublicNotFound() {
  return (
    <ProblemPage
      title="We could not find that page"
      message="The address may be mistyped, or what it pointed to has been removed."
    />
  );
}
