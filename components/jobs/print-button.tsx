"use client";

import { Printer } from "lucide-react";
import { Button } from "@/components/ui/button";

/** Opens the browser's print dialogue (print, or save as PDF). */
export function PrintButton({ label = "Print or save as PDF" }: { label?: string }) {
  return (
    <Button type="button" variant="secondary" className="no-print" onClick={() => window.print()}>
      <Printer aria-hidden className="mr-2 inline h-5 w-5" />
      {label}
    </Button>
  );
}
