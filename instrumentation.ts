/** Runs once per server process before it handles requests (Next.js instrumentation hook). */
export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { installPeerAddressHeader } = await import("./lib/server/peer-address");
  installPeerAddressHeader();
}
