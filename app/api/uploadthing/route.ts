import { createRouteHandler } from "uploadthing/next";
import { fileRouter } from "@/lib/server/uploads/router";
import { uploadConfig } from "@/lib/server/uploads/config";

const c = uploadConfig();

// Production flow against the fake as against the real service: the service calls us back.
export const { GET, POST } = createRouteHandler({
  router: fileRouter,
  config: {
    token: c.token,
    ingestUrl: c.ingestUrl,
    callbackUrl: c.callbackUrl,
    isDev: false,
    logLevel: "Error",
  },
});
