import { messageSchema } from "@/lib/validation/message";
import { env } from "@/lib/env";
import { sqlDateTime } from "@/lib/time";
import type { Actor } from "./actor";
import { transactionWithRetry, type Db } from "./db";
import { forbidden, notFound, parseInput, unprocessable } from "./errors";
import { notifyNewMessage } from "./notify";
import type { Message } from "@/lib/types/messages";

export type { Message } from "@/lib/types/messages";

export { messageSchema } from "@/lib/validation/message";

/**
 * The thread between a request's homeowner and one quoting reviewer. Reading: the reviewer
 * reaches only their own thread; the homeowner and an admin name which reviewer's thread.
 * Writing (`write`): the homeowner, or the thread's reviewer while their quote is live or
 * accepted and they are not suspended; an admin reads only.
 */
async function threadFor(
  db: Db,
  actor: Actor,
  requestId: number,
  reviewerId?: number,
  write = false,
) {
  const request = await db("requests").where({ id: requestId }).first("id", "homeowner_id");
  if (!request) throw notFound("No such request.");
  let thread;
  if (actor.role === "reviewer") {
    thread = await db("message_threads")
      .where({ request_id: requestId, reviewer_id: actor.id })
      .first("id", "reviewer_id");
    if (!thread) throw forbidden("Quote on the request to message the homeowner.");
  } else if (
    (actor.role === "homeowner" && Number(request.homeowner_id) === actor.id) ||
    (actor.role === "admin" && !write)
  ) {
    if (!reviewerId) throw unprocessable("Say which reviewer's conversation.");
    thread = await db("message_threads")
      .where({ request_id: requestId, reviewer_id: reviewerId })
      .first("id", "reviewer_id");
    if (!thread) throw notFound("No conversation with that reviewer.");
  } else if (actor.role === "admin") {
    throw forbidden("Admins can read conversations but not take part in them.");
  } else {
    throw notFound("No such request.");
  }
  const quote = await db("quotes as q")
    .leftJoin("reviewer_profiles as rp", "rp.user_id", "q.reviewer_id")
    .where({ "q.request_id": requestId, "q.reviewer_id": thread.reviewer_id })
    .orderByRaw("q.status = 'accepted' DESC, q.status = 'live' DESC, q.id DESC")
    .first("q.status", "rp.suspended_at");
  const accepted = quote?.status === "accepted";
  if (write && actor.role === "reviewer") {
    if (quote?.suspended_at)
      throw forbidden("Your reviewer account is suspended, so you cannot send messages.");
    if (!quote || (quote.status !== "live" && !accepted))
      throw forbidden(
        "Your quote on this request is no longer open, so the conversation is closed.",
      );
  }
  return { threadId: Number(thread.id), accepted };
}

/** What a reviewer calls the homeowner before their quote is accepted. */
export const HOMEOWNER_BEFORE_ACCEPTANCE = "The homeowner";

export async function listMessages(
  db: Db,
  actor: Actor,
  requestId: number,
  reviewerId?: number,
): Promise<Message[]> {
  const { threadId, accepted } = await threadFor(db, actor, requestId, reviewerId);
  const rows = await db("messages as m")
    .join("users as u", "u.id", "m.sender_id")
    .where("m.thread_id", threadId)
    .orderBy("m.id")
    .limit(500)
    .select("m.id", "m.sender_id", "m.body_md", "m.created_at", "u.display_name", "u.role");
  // Until the homeowner accepts their quote, a reviewer never learns the homeowner's name.
  const hideHomeowner = actor.role !== "homeowner" && actor.role !== "admin" && !accepted;
  const last = rows.at(-1);
  if (last && actor.role !== "admin") {
    await db.raw(
      "INSERT INTO message_reads (thread_id, user_id, last_read_message_id) VALUES (?, ?, ?) ON DUPLICATE KEY UPDATE last_read_message_id = GREATEST(last_read_message_id, VALUES(last_read_message_id))",
      [threadId, actor.id, last.id],
    );
  }
  return rows.map((r) => ({
    id: Number(r.id),
    mine: Number(r.sender_id) === actor.id,
    senderName:
      hideHomeowner && r.role === "homeowner" ? HOMEOWNER_BEFORE_ACCEPTANCE : r.display_name,
    bodyMd: r.body_md,
    createdAt: r.created_at,
  }));
}

export async function postMessage(
  db: Db,
  actor: Actor,
  requestId: number,
  input: unknown,
  reviewerId?: number,
): Promise<number> {
  const { threadId } = await threadFor(db, actor, requestId, reviewerId, true);
  const v = parseInput(messageSchema, input, "The message needs attention.");
  // Lock the thread first: the message's foreign key takes a shared lock on it, which two
  // writers would each try to upgrade for the update below (a deadlock). A victim still retries.
  return transactionWithRetry(db, async (trx) => {
    await trx("message_threads").where({ id: threadId }).forUpdate().first("id");
    const [id] = await trx("messages").insert({
      thread_id: threadId,
      sender_id: actor.id,
      body_md: v.body,
    });
    await trx("message_threads").where({ id: threadId }).update({ last_message_at: sqlDateTime() });
    await notifyNewMessage(trx, env().APP_URL, Number(id));
    return Number(id);
  });
}

/** Messages sent to this person that they have not opened yet, across all their threads. */
export async function countUnread(db: Db, actor: Actor): Promise<number> {
  const userId = actor.id;
  // Two indexed counts (threads where the user reviews, threads on the user's own requests)
  // rather than one OR across the join, which made MariaDB read every message on each page.
  // A user is never both the reviewer and the homeowner of one request, so nothing counts twice.
  const unread = () =>
    db("messages as m")
      .join("message_threads as t", "t.id", "m.thread_id")
      .leftJoin("message_reads as mr", function () {
        this.on("mr.thread_id", "t.id").andOnVal("mr.user_id", userId);
      })
      .whereNot("m.sender_id", userId)
      .where((w) =>
        w.whereNull("mr.last_read_message_id").orWhereRaw("m.id > mr.last_read_message_id"),
      );
  const [[asReviewer], [asHomeowner]] = (await Promise.all([
    unread().where("t.reviewer_id", userId).count({ n: "*" }),
    unread()
      .join("requests as r", "r.id", "t.request_id")
      .where("r.homeowner_id", userId)
      .count({ n: "*" }),
  ])) as [[{ n: number }], [{ n: number }]];
  return Number(asReviewer.n) + Number(asHomeowner.n);
}
