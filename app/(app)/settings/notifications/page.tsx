import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { getCurrentUser, pageUser } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { getPreferences, savePreferences } from "@/lib/server/preferences";
import { Card } from "@/components/ui/card";
import { Button } from "@/components/ui/button";

export const metadata: Metadata = { title: "E-mail settings" };

async function save(formData: FormData) {
  "use server";
  const user = await getCurrentUser();
  if (!user) redirect("/sign-in");
  await savePreferences(db(), user.id, {
    notifyNewMessage: formData.get("notifyNewMessage") === "on",
    notifyNewQuote: formData.get("notifyNewQuote") === "on",
  });
  redirect("/settings/notifications?saved=1");
}

export default async function NotificationSettingsPage({
  searchParams,
}: {
  searchParams: Promise<{ saved?: string }>;
}) {
  const user = (await pageUser("/settings/notifications"))!;
  const prefs = await getPreferences(db(), user.id);
  const { saved } = await searchParams;
  return (
    <div className="max-w-2xl space-y-4">
      <h1 className="text-3xl font-bold">E-mail settings</h1>
      {saved ? (
        <p role="status" className="rounded-lg bg-level-ok-bg p-3 text-level-ok">
          Saved.
        </p>
      ) : null}
      <Card>
        <form action={save} className="space-y-4">
          <fieldset className="space-y-3">
            <legend className="font-semibold">E-mails you can switch off</legend>
            <label className="flex min-h-12 items-center gap-3">
              <input
                type="checkbox"
                name="notifyNewMessage"
                defaultChecked={prefs.notifyNewMessage}
                className="h-6 w-6 accent-copper-600"
              />
              New messages (at most one e-mail per conversation every 15 minutes)
            </label>
            {user.role === "homeowner" ? (
              <label className="flex min-h-12 items-center gap-3">
                <input
                  type="checkbox"
                  name="notifyNewQuote"
                  defaultChecked={prefs.notifyNewQuote}
                  className="h-6 w-6 accent-copper-600"
                />
                New quotes on your requests
              </label>
            ) : (
              <input type="hidden" name="notifyNewQuote" value={prefs.notifyNewQuote ? "on" : ""} />
            )}
          </fieldset>
          <p className="text-sm text-slate-600">
            E-mails about payments, reports, disputes, credentials and your account always go: they
            need you to act.
          </p>
          <Button type="submit">Save</Button>
        </form>
      </Card>
    </div>
  );
}
