import { generateReactHelpers } from "@uploadthing/react";
import type { LoopwrightFileRouter } from "@/lib/server/uploads/router";

export const { useUploadThing } = generateReactHelpers<LoopwrightFileRouter>({
  url: "/api/uploadthing",
});
