"use client";

import { useEffect, useRef } from "react";
import type { ActionState } from "@/lib/types/action";

/**
 * After a refused submit, move the keyboard focus to the first field marked invalid, so a
 * keyboard or screen-reader user lands on what needs fixing (its error is tied to it by
 * aria-describedby). Returns the ref to put on the form.
 */
export function useFocusFirstError(state: ActionState) {
  const ref = useRef<HTMLFormElement>(null);
  useEffect(() => {
    if (state.ok || !state.fieldErrors || Object.keys(state.fieldErrors).length === 0) return;
    ref.current?.querySelector<HTMLElement>('[aria-invalid="true"]')?.focus();
  }, [state]);
  return ref;
}
