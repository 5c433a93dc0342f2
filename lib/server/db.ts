import "server-only";
export { getDb as db } from "@/lib/data/db";
