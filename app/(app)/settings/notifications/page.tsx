import type { Metadata } from "next";
import { pageUser } from "@/lib/server/auth/session";
import { db } from "@/lib/server/db";
import { getPreferences } from "@/lib/data/preferences";
import { Card } from "@/components/ui/card";
import { ActionForm } from "@/components/ui/action-form";
import { saveNotificationSettings } from "@/components/settings/actions";

export const metadata: Metadata = { title: "E-mail settings" };

export default async function NotificationSettingsPage() {
  const user = await pageUser("/settings/notifications");
  const prefs = await getPreferences(db(), user);
  return (
    <div className="max-w-2xl space-y-4">
      <h1 className="text-3xl font-bold">E-mail settings</h1>
      <Card>
        <ActionForm
          action={saveNotificationSettings}
          submitLabel="Save"
          pendingLabel="Saving…"
          variant="primary"
          className="space-y-4"
        >
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
        </ActionForm>
      </Card>
    </div>
  );
}
