import { notFound } from "next/navigation";
import { connection } from "next/server";

/**
 * Any address no page answers. app/not-found.tsx itself is prerendered with the static pages, so
 * it would carry no CSP nonce; answering here first renders it per request, with the nonce on
 * its scripts (proxy.ts, lib/security-headers.ts).
 */
export default async function NoSuchPage(): Promise<never> {
  await connection();
  notFound();
}
