import { z } from "zod";

/** A message in a request's thread. */
export const messageSchema = z.object({
  body: z.string().trim().min(1, "Write a message").max(4000, "At most 4,000 characters"),
});
export type MessageInput = z.input<typeof messageSchema>;
