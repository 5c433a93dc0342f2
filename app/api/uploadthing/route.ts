import { createRouteHandler } from "uploadthing/next";
import { fileRouter } from "@/lib/server/uploads/router";
import { uploadConfig } from "@/lib/server/uploads/config";
import { refuseBadJson } from "@/lib/server/http";

const c = uploadConfig();

// Production flow against the fake as against the real service: the service calls us back.
const handlers = createRouteHandler({
  router: fileRouter,
  config: {
    token: c.token,
    ingestUrl: c.ingestUrl,
    callbackUrl: c.callbackUrl,
    isDev: false,
    logLevel: "Error",
  },
});

export const GET = handlers.GET;

/**
 * Upload requests and the service's callbacks are small, shallow JSON: anything larger, deeper or
 * not JSON is refused with a 4xx before the SDK parses it (a body nested thousands deep made its
 * validator overflow the stack, a 500).
 */
export async function POST(req: Request) {
  const refused = await refuseBadJson(req, { maxBytes: 256 * 1024, maxDepth: 32 });
  return refused ?? handlers.POST(req as never);
}
