"use client";

import { useEffect, useState } from "react";
import { inputClass } from "@/components/ui/field";

/**
 * The site's nearest town, looked up in the app's own gazetteer (/api/towns) as you type; the
 * chosen town's id is sent as `siteTownId` and the server derives the point from it.
 */
export function TownPicker({ error }: { error?: string }) {
  const [query, setQuery] = useState("");
  const [towns, setTowns] = useState<{ id: number; label: string }[]>([]);
  useEffect(() => {
    if (query.trim().length < 2) return;
    const timer = setTimeout(async () => {
      const res = await fetch(`/api/towns?q=${encodeURIComponent(query.trim())}`);
      if (res.ok) setTowns(((await res.json()) as { towns: typeof towns }).towns);
    }, 250);
    return () => clearTimeout(timer);
  }, [query]);
  return (
    <div className="grid gap-x-4 sm:col-span-2 sm:grid-cols-2">
      <label className="text-sm font-semibold" htmlFor="f-townSearch">
        Nearest town
        <span className="block font-normal text-slate-600">
          Type two or more letters, then choose the town
        </span>
        <input
          id="f-townSearch"
          type="search"
          autoComplete="off"
          value={query}
          onChange={(e) => setQuery(e.target.value)}
          className={inputClass}
        />
      </label>
      <label className="text-sm font-semibold" htmlFor="f-siteTownId">
        Town
        <span className="block font-normal text-slate-600">Used for distances on the board</span>
        <select
          id="f-siteTownId"
          name="siteTownId"
          className={inputClass}
          aria-invalid={error ? true : undefined}
          aria-describedby="f-siteTownId-error"
        >
          <option value="">{towns.length ? "Choose the town…" : "No town chosen"}</option>
          {towns.map((t) => (
            <option key={t.id} value={t.id}>
              {t.label}
            </option>
          ))}
        </select>
        <span id="f-siteTownId-error" className="block text-level-stop">
          {error ?? ""}
        </span>
      </label>
    </div>
  );
}
