import { Button } from "@/components/ui/button";

export function VerifyEmailBanner({
  action,
  sent,
}: {
  action: () => Promise<void>;
  sent: boolean;
}) {
  return (
    <div
      role="status"
      className="flex flex-wrap items-center justify-between gap-3 rounded-card border border-level-note bg-level-note-bg p-4"
    >
      <p>
        {sent
          ? "A new confirmation link is on its way: check the inbox."
          : "Please confirm your e-mail address: we sent you a link when you signed up."}
      </p>
      {sent ? null : (
        <form action={action}>
          <Button type="submit" variant="secondary">
            Send the link again
          </Button>
        </form>
      )}
    </div>
  );
}
