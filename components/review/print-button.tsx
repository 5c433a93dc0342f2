"use client";

import { Button } from "@/components/ui/button";

/** Opens the browser's print dialog ("Save as PDF" gives the report as a document). */
export function PrintButton() {
  return (
    <Button type="button" variant="secondary" className="no-print" onClick={() => window.print()}>
      Print or save as PDF
    </Button>
  );
}
