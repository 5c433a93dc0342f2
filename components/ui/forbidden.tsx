export function Forbidden({
  message = "This page is not available to your account.",
}: {
  message?: string;
}) {
  return (
    <div role="alert" className="rounded-card border border-level-stop bg-level-stop-bg p-6">
      <h1 className="text-2xl font-bold text-level-stop">Not available (403)</h1>
      <p className="mt-2">{message}</p>
    </div>
  );
}
