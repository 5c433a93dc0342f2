"use client";

import { useState } from "react";
import { useForm } from "react-hook-form";
import { zodResolver } from "@hookform/resolvers/zod";
import { systemSchema, type System, type SystemInput } from "@/lib/validation/system";
import { runLoopCheck, type LoopCheckResult } from "@/lib/calc/loop-check";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { SectionFields } from "./section-fields";
import { SECTIONS } from "./system-fields";
import { LoopCheckResults } from "./loop-check-results";

export interface LoopCheckFormProps {
  defaultValues: SystemInput;
}

/** The public loop check: the whole description on one page, checked in the browser. */
export function LoopCheckForm({ defaultValues }: LoopCheckFormProps) {
  const [result, setResult] = useState<LoopCheckResult>(() => runLoopCheck(defaultValues));
  const form = useForm<SystemInput, unknown, System>({
    resolver: zodResolver(systemSchema),
    defaultValues,
    mode: "onBlur",
  });

  const onValid = (system: System) => setResult(runLoopCheck(system));

  return (
    <div className="grid gap-8 lg:grid-cols-[minmax(0,5fr)_minmax(0,6fr)]">
      <form
        onSubmit={form.handleSubmit(onValid)}
        noValidate
        aria-label="System description"
        className="space-y-6"
      >
        {SECTIONS.map((section) => (
          <Card key={section.id}>
            <SectionFields form={form} section={section} />
          </Card>
        ))}
        {Object.keys(form.formState.errors).length > 0 ? (
          <p role="alert" className="font-semibold text-level-stop">
            Some values need attention: see the messages beside the fields.
          </p>
        ) : null}
        <div className="sticky bottom-0 bg-slate-50/95 py-3">
          <Button type="submit" className="w-full">
            Run the loop check
          </Button>
        </div>
      </form>
      <div className="lg:sticky lg:top-4 lg:max-h-[calc(100vh-2rem)] lg:overflow-y-auto">
        <LoopCheckResults result={result} />
      </div>
    </div>
  );
}
