import type { Metadata } from "next";
import { LoopCheckForm } from "@/components/loop-check/loop-check-form";
import { SECTIONS } from "@/components/loop-check/system-fields";
import { runLoopCheck } from "@/lib/calc/loop-check";
import { Cautions } from "@/components/ui/caution";
import { demoSystem } from "@/lib/calc/demo-system";

export const metadata: Metadata = { title: "Loop check" };

/** The example's results, worked out once on the server; the browser checks every change. */
const demoResult = runLoopCheck(demoSystem);

export default function LoopCheckPage() {
  return (
    <div className="space-y-6">
      <header className="space-y-2">
        <h1 className="text-3xl font-bold">Loop check</h1>
        <p className="max-w-3xl text-lg text-slate-700">
          Describe the solar primary loop and get the numbers a reviewer would start from: fluid
          volume, expansion vessel and pre-charge, fill pressure, relief margin, freeze protection,
          flow and stagnation. The form starts with an example system; change it to yours. Nothing
          is saved.
        </p>
      </header>
      <Cautions compact />
      <LoopCheckForm defaultValues={demoSystem} initialResult={demoResult} sections={SECTIONS} />
    </div>
  );
}
