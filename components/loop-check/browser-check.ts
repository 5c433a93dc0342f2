/**
 * What the public loop check needs to check values in the browser: the system schema (zod),
 * its resolver and the calculation. The form loads this module when someone first changes or
 * leaves a field, so the page itself ships without zod; the first results come from the server.
 */
import { zodResolver } from "@hookform/resolvers/zod";
import { systemSchema } from "@/lib/validation/system";

export { runLoopCheck } from "@/lib/calc/loop-check";

export const systemResolver = zodResolver(systemSchema);
