import { messageSchema } from "@/lib/validation/message";
import { env } from "@/lib/env";
import { sqlDateTime } from "@/lib/time";
import type { Actor } from "./actor";
import type { Db } from "./db";
import { forbidden, notFound, parseInput, unprocessable } from "./errors";
import { notifyNewMessage } from "./notify";
import type { Message } from "@/lib/types/messages";

export type { Message } from "@/lib/types/messages";

export { messageSchema } from "@/lib/validation/message";

/**
 * The thread between a request's homeowner and one quoting reviewer. Only those two take part:
 * a reviewer reaches only their own thread; the homeowner names which reviewer's thread.
 */
async function threadFor(db: Db, actor: Actor, requestId: number, reviewerId?: number) {
  const request = await db("requests").where({ id: requestId }).first("id", "homeowner_id");
  if (!request) throw notFound("No such request.");
  let thread;
  if (actor.role === "reviewer") {
    thread = await db("message_threads")
      .where({ request_id: requestId, reviewer_id: actor.id })
      .first("id", "reviewer_id");
    if (!thread) throw forbidden("Quote on the request to message the homeowner.");
  } else if (actor.role === "homeowner" && Number(request.homeowner_id) === actor.id) {
    if (!reviewerId) throw unprocessable("Say which reviewer's conversation.");
    thread = await db("message_threads")
      .where({ request_id: requestId, reviewer_id: reviewerId })
      .first("id", "reviewer_id");
    if (!thread) throw notFound("No conversation with that reviewer.");
  } else {
    throw notFound("No such request.");
  }
  return { threadId: Number(thread.id) };
}

export async function listMessages(
  db: Db,
  actor: Actor,
  requestId: number,
  reviewerId?: number,
): Promise<Message[]> {
  const { threadId } = await threadFor(db, actor, requestId, reviewerId);
  const rows = await db("messages as m")
    .join("users as u", "u.id", "m.sender_id")
    .where("m.thread_id", threadId)
    .orderBy("m.id")
    .limit(500)
    .select("m.id", "m.sender_id", "m.body_md", "m.created_at", "u.display_name");
  const last = rows.at(-1);
  if (last) {
    await db.raw(
      "INSERT INTO message_reads (thread_id, user_id, last_read_message_id) VALUES (?, ?, ?) ON DUPLICATE KEY UPDATE last_read_message_id = GREATEST(last_read_message_id, VALUES(last_read_message_id))",
      [threadId, actor.id, last.id],
    );
  }
  return rows.map((r) => ({
    id: Number(r.id),
    mine: Number(r.sender_id) === actor.id,
    senderName: r.display_name,
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
  const v = parseInput(messageSchema, input, "The message needs attention.");
  const { threadId } = await threadFor(db, actor, requestId, reviewerId);
  return db.transaction(async (trx) => {
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
