"use client";

import { SegmentError } from "@/components/ui/segment-error";

export default function AppError({
  reset,
}: {
  error: Error & { digest?: string };
  reset: () => void;
}) {
  return <SegmentError reset={reset} homeHref="/dashboard" homeLabel="Back to your dashboard" />;
}
