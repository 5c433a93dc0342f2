"use client";

import { useEffect, useRef, useState } from "react";
import { useForm, useWatch, type Resolver } from "react-hook-form";
import type { System, SystemInput } from "@/lib/validation/system";
import type { LoopCheckResult } from "@/lib/calc/loop-check";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { SectionFields } from "./section-fields";
import type { SectionDef } from "./system-fields";
import { LevelBadge } from "./level-badge";
import { levelCounts, LoopCheckResults } from "./loop-check-results";

export interface LoopCheckFormProps {
  defaultValues: SystemInput;
  /** The loop check of `defaultValues`, run on the server. */
  initialResult: LoopCheckResult;
  /** `SECTIONS`, passed by the page: the schema they come from stays on the server. */
  sections: readonly SectionDef[];
}

/** The schema and the calculation, fetched once when someone first edits a field. */
const loadCheck = () => import("./browser-check");

const resolver: Resolver<SystemInput, unknown, System> = async (values, context, options) =>
  (await loadCheck()).systemResolver(values, context, options);

/** The public loop check: the whole description on one page, checked in the browser. */
export function LoopCheckForm({ defaultValues, initialResult, sections }: LoopCheckFormProps) {
  const [result, setResult] = useState<LoopCheckResult>(initialResult);
  const form = useForm<SystemInput, unknown, System>({ resolver, defaultValues, mode: "onBlur" });

  // The results follow the fields as they change (debounced): runLoopCheck validates each
  // section itself and never throws, so a half-typed value only holds back its own findings.
  const values = useWatch({ control: form.control });
  const firstRun = useRef(true);
  useEffect(() => {
    if (firstRun.current) {
      firstRun.current = false;
      return;
    }
    let live = true;
    const timer = setTimeout(
      () =>
        void loadCheck().then(({ runLoopCheck }) => {
          if (live) setResult(runLoopCheck(values as SystemInput));
        }),
      400,
    );
    return () => {
      live = false;
      clearTimeout(timer);
    };
  }, [values]);

  const showResults = () => {
    const box = document.getElementById("loop-check-results");
    box?.scrollIntoView({ block: "start" });
    box?.querySelector<HTMLElement>("#results-title")?.focus({ preventScroll: true });
  };

  const onValid = async (system: System) => {
    const { runLoopCheck } = await loadCheck();
    setResult(runLoopCheck(system));
    showResults();
  };

  return (
    <div className="grid gap-8 lg:grid-cols-[minmax(0,5fr)_minmax(0,6fr)]">
      <form
        onSubmit={form.handleSubmit(onValid)}
        noValidate
        aria-label="System description"
        className="space-y-6"
      >
        {sections.map((section) => (
          <Card key={section.id}>
            <SectionFields form={form} section={section} />
          </Card>
        ))}
        {Object.keys(form.formState.errors).length > 0 ? (
          <p role="alert" className="font-semibold text-level-stop">
            Some values need attention: see the messages beside the fields.
          </p>
        ) : null}
        <div className="sticky bottom-0 space-y-2 bg-slate-50/95 py-3">
          {/* On phones the results sit below the whole form: the summary stays in view here. */}
          <a
            href="#loop-check-results"
            data-testid="results-summary"
            aria-live="polite"
            className="flex flex-wrap items-center gap-2 rounded-lg border border-slate-300 bg-white px-3 py-2 text-sm lg:hidden"
            onClick={(e) => {
              e.preventDefault();
              showResults();
            }}
          >
            <LevelBadge level={result.worst} />
            <span>{levelCounts(result)}</span>
            <span className="ml-auto font-semibold underline">See the results</span>
          </a>
          <Button type="submit" className="w-full">
            Run the loop check
          </Button>
        </div>
      </form>
      <div
        id="loop-check-results"
        className="scroll-mt-4 lg:sticky lg:top-4 lg:max-h-[calc(100vh-2rem)] lg:overflow-y-auto"
      >
        <LoopCheckResults result={result} />
      </div>
    </div>
  );
}
