import type { Metadata } from "next";
import { pageUser } from "@/lib/server/auth/session";
import { Card } from "@/components/ui/card";
import { NewProjectForm } from "@/components/projects/new-project-form";

export const metadata: Metadata = { title: "New project" };

export default async function NewProjectPage() {
  await pageUser("/projects/new", ["homeowner"]);
  return (
    <div className="max-w-2xl space-y-4">
      <h1 className="text-3xl font-bold">New project</h1>
      <p className="text-slate-700">
        You will describe the system in nine short steps. Each step is saved as you go, so you can
        stop and come back. Have the collector, pump station and vessel data plates or manuals to
        hand.
      </p>
      <Card>
        <NewProjectForm />
      </Card>
    </div>
  );
}
