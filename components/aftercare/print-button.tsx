"use client";

import { Printer } from "lucide-react";
import { Button } from "@/components/ui/button";

/** Opens the browser's print dialog ("print to PDF" gives a tidy copy). */
export function PrintButton({ label = "Print or save as PDF" }: { label?: string }) {
  return (
    <Button
      type="button"
      variant="secondary"
      className="print:hidden"
      onClick={() => window.print()}
    >
      <Printer aria-hidden className="h-5 w-5" /> {label}
    </Button>
  );
}
