/**
 * The notifications: one function per event that someone must act on. Each reads what the
 * e-mail needs and queues it in the caller's transaction. Dedupe keys tie an e-mail to its
 * event, so a repeated event (a webhook delivered twice, a retried action) sends nothing new.
 */
import { env } from "@/lib/env";
import { formatMoney } from "@/lib/money";
import { credentialName } from "@/lib/credentials";
import { visitInvitation } from "@/lib/mail/calendar";
import { formatWhen, fromSqlDateTime, sqlDateTime } from "@/lib/time";
import type { Db } from "./db";
import { jobWithPeople } from "./job-query";
import { enqueueEmail } from "./outbox";
import { itemTitle } from "@/lib/checklist/item-titles";
import type { TemplatePayloads } from "@/lib/mail/kinds";

type Trx = Db;

/** At most one new-message e-mail per thread and recipient in this window. */
export const MESSAGE_EMAIL_WINDOW_MS = 15 * 60_000;

const OUTCOMES: Record<string, string> = {
  ready_to_commission: "ready to commission",
  fix_before_filling: "fix before filling",
  do_not_proceed: "do not proceed",
};
const RESOLUTIONS: Record<string, string> = {
  release: "the payment is released to the reviewer",
  partial_refund: "part of the payment is refunded",
  full_refund: "the payment is refunded in full",
};

async function quoteContext(trx: Trx, quoteId: number) {
  const q = await trx("quotes as q")
    .join("requests as r", "r.id", "q.request_id")
    .join("projects as p", "p.id", "r.project_id")
    .join("users as h", "h.id", "r.homeowner_id")
    .join("users as v", "v.id", "q.reviewer_id")
    .leftJoin("reviewer_profiles as rp", "rp.user_id", "q.reviewer_id")
    .where("q.id", quoteId)
    .first(
      "q.id",
      "q.price_minor",
      "q.currency",
      "q.decline_reason",
      "r.id as request_id",
      "r.status as request_status",
      "p.title",
      "h.id as homeowner_id",
      "h.email as homeowner_email",
      "h.display_name as homeowner_name",
      "v.id as reviewer_id",
      "v.email as reviewer_email",
      "v.display_name as reviewer_name",
      "rp.trading_name",
    );
  if (!q) throw new Error(`quote ${quoteId} not found`);
  return q;
}

async function jobContext(trx: Trx, jobId: number) {
  const j = await jobWithPeople(trx, jobId).first(
    "j.id",
    "j.amount_minor",
    "j.fee_minor",
    "j.currency",
    "j.release_due_at",
    "p.title",
    "h.id as homeowner_id",
    "h.email as homeowner_email",
    "h.display_name as homeowner_name",
    "v.id as reviewer_id",
    "v.email as reviewer_email",
    "v.display_name as reviewer_name",
    "rp.trading_name",
  );
  if (!j) throw new Error(`job ${jobId} not found`);
  return j;
}

export async function notifyNewQuote(trx: Trx, appUrl: string, quoteId: number) {
  const q = await quoteContext(trx, quoteId);
  return enqueueEmail(trx, {
    to: { address: q.homeowner_email, userId: q.homeowner_id },
    template: "new_quote",
    payload: {
      name: q.homeowner_name,
      projectTitle: q.title,
      reviewerName: q.trading_name ?? q.reviewer_name,
      price: formatMoney(q.price_minor, q.currency),
      url: `${appUrl}/requests/${q.request_id}`,
    },
    dedupeKey: `quote-${q.id}-new`,
  });
}

export async function notifyQuoteAccepted(
  trx: Trx,
  appUrl: string,
  quoteId: number,
  jobId: number,
) {
  const q = await quoteContext(trx, quoteId);
  return enqueueEmail(trx, {
    to: { address: q.reviewer_email, userId: q.reviewer_id },
    template: "quote_accepted",
    payload: {
      name: q.reviewer_name,
      projectTitle: q.title,
      price: formatMoney(q.price_minor, q.currency),
      url: `${appUrl}/jobs/${jobId}`,
    },
    dedupeKey: `quote-${q.id}-accepted`,
  });
}

export async function notifyQuoteDeclined(trx: Trx, appUrl: string, quoteId: number) {
  const q = await quoteContext(trx, quoteId);
  return enqueueEmail(trx, {
    to: { address: q.reviewer_email, userId: q.reviewer_id },
    template: "quote_declined",
    payload: {
      name: q.reviewer_name,
      projectTitle: q.title,
      reason: q.decline_reason,
      // Awarded: another quote was accepted; still open: the homeowner declined this one.
      chosenAnother: q.request_status === "awarded",
      url: `${appUrl}/requests/${q.request_id}`,
    },
    dedupeKey: `quote-${q.id}-declined`,
  });
}

/** Funds held: the homeowner is told their money is safe; the reviewer can start. */
export async function notifyPaymentReceived(trx: Trx, appUrl: string, jobId: number) {
  const j = await jobContext(trx, jobId);
  const amount = formatMoney(j.amount_minor, j.currency);
  const url = `${appUrl}/jobs/${j.id}`;
  for (const [address, userId, name] of [
    [j.homeowner_email, j.homeowner_id, j.homeowner_name],
    [j.reviewer_email, j.reviewer_id, j.reviewer_name],
  ] as const) {
    await enqueueEmail(trx, {
      to: { address, userId },
      template: "payment_received",
      payload: { name, projectTitle: j.title, amount, url },
      dedupeKey: `job-${j.id}-funded-${userId}`,
    });
  }
}

/** A refund's receipt, to the homeowner. */
export async function notifyRefundIssued(
  trx: Trx,
  appUrl: string,
  jobId: number,
  amountMinor: number,
) {
  const j = await jobContext(trx, jobId);
  return enqueueEmail(trx, {
    to: { address: j.homeowner_email, userId: j.homeowner_id },
    template: "refund_issued",
    payload: {
      name: j.homeowner_name,
      projectTitle: j.title,
      amount: formatMoney(amountMinor, j.currency),
      url: `${appUrl}/jobs/${j.id}`,
    },
    dedupeKey: `job-${j.id}-refund-${amountMinor}`,
  });
}

/** The reviewer's payout account has become ready. */
export async function notifyPayoutAccountReady(trx: Trx, appUrl: string, reviewerId: number) {
  const u = await trx("users").where({ id: reviewerId }).first("id", "email", "display_name");
  if (!u) return "opted_out" as const;
  return enqueueEmail(trx, {
    to: { address: u.email, userId: Number(u.id) },
    template: "payout_account_ready",
    payload: { name: u.display_name, url: `${appUrl}/reviewer/earnings` },
    dedupeKey: `payout-ready-${reviewerId}`,
  });
}

export async function notifyReviewStarted(trx: Trx, appUrl: string, jobId: number) {
  const j = await jobContext(trx, jobId);
  return enqueueEmail(trx, {
    to: { address: j.homeowner_email, userId: j.homeowner_id },
    template: "review_started",
    payload: {
      name: j.homeowner_name,
      projectTitle: j.title,
      reviewerName: j.trading_name ?? j.reviewer_name,
      url: `${appUrl}/jobs/${j.id}`,
    },
    dedupeKey: `job-${j.id}-review-started`,
  });
}

export async function notifyReportDelivered(
  trx: Trx,
  appUrl: string,
  jobId: number,
  outcome: string,
) {
  const j = await jobContext(trx, jobId);
  return enqueueEmail(trx, {
    to: { address: j.homeowner_email, userId: j.homeowner_id },
    template: "report_delivered",
    payload: {
      name: j.homeowner_name,
      projectTitle: j.title,
      outcome: OUTCOMES[outcome] ?? outcome,
      releaseBy: String(j.release_due_at ?? "").slice(0, 10),
      url: `${appUrl}/jobs/${j.id}/report`,
    },
    dedupeKey: `job-${j.id}-delivered`,
  });
}

/** The reviewer asks the homeowner for a photo or a fact about one checklist item. */
export async function notifyItemRequested(trx: Trx, appUrl: string, itemRequestId: number) {
  const q = await trx("item_requests").where({ id: itemRequestId }).first();
  if (!q) throw new Error(`item request ${itemRequestId} not found`);
  const j = await jobContext(trx, Number(q.job_id));
  const project = await trx("jobs as j")
    .join("requests as r", "r.id", "j.request_id")
    .where("j.id", q.job_id)
    .first("r.project_id");
  return enqueueEmail(trx, {
    to: { address: j.homeowner_email, userId: j.homeowner_id },
    template: "item_requested",
    payload: {
      name: j.homeowner_name,
      projectTitle: j.title,
      reviewerName: j.trading_name ?? j.reviewer_name,
      kind: q.kind,
      itemTitle: itemTitle(String(q.item_key)),
      question: String(q.question_md).replace(/\s+/g, " ").slice(0, 300),
      url: `${appUrl}/projects/${project.project_id}#reviewer-questions`,
    },
    dedupeKey: `item-request-${q.id}`,
  });
}

export async function notifyFundsReleased(trx: Trx, appUrl: string, jobId: number) {
  const j = await jobContext(trx, jobId);
  return enqueueEmail(trx, {
    to: { address: j.reviewer_email, userId: j.reviewer_id },
    template: "funds_released",
    payload: {
      name: j.reviewer_name,
      projectTitle: j.title,
      amount: formatMoney(j.amount_minor - j.fee_minor, j.currency),
      url: `${appUrl}/jobs/${j.id}`,
    },
    dedupeKey: `job-${j.id}-released`,
  });
}

/** A dispute goes to the reviewer and to every admin, who settle it. */
export async function notifyDisputeOpened(trx: Trx, appUrl: string, jobId: number, reason: string) {
  const j = await jobContext(trx, jobId);
  const admins = await trx("users").where({ role: "admin" }).select("id", "email", "display_name");
  const recipients = [
    {
      id: j.reviewer_id,
      email: j.reviewer_email,
      display_name: j.reviewer_name,
      path: `/jobs/${j.id}`,
    },
    ...admins.map((a) => ({ ...a, path: `/admin/disputes` })),
  ];
  for (const r of recipients) {
    await enqueueEmail(trx, {
      to: { address: r.email, userId: r.id },
      template: "dispute_opened",
      payload: { name: r.display_name, projectTitle: j.title, reason, url: `${appUrl}${r.path}` },
      dedupeKey: `job-${j.id}-dispute-opened-${r.id}`,
    });
  }
}

export async function notifyDisputeSettled(
  trx: Trx,
  appUrl: string,
  jobId: number,
  resolution: string,
) {
  const j = await jobContext(trx, jobId);
  for (const [address, userId, name] of [
    [j.homeowner_email, j.homeowner_id, j.homeowner_name],
    [j.reviewer_email, j.reviewer_id, j.reviewer_name],
  ] as const) {
    await enqueueEmail(trx, {
      to: { address, userId },
      template: "dispute_settled",
      payload: {
        name,
        projectTitle: j.title,
        resolution: RESOLUTIONS[resolution] ?? resolution,
        url: `${appUrl}/jobs/${j.id}`,
      },
      dedupeKey: `job-${j.id}-dispute-settled-${userId}`,
    });
  }
}

async function credentialContext(trx: Trx, credentialId: number) {
  const c = await trx("credentials as c")
    .join("users as u", "u.id", "c.reviewer_id")
    .where("c.id", credentialId)
    .first(
      "c.id",
      "c.kind",
      "c.expires_on",
      "c.admin_reason",
      "c.reviewed_at",
      "u.id as user_id",
      "u.email",
      "u.display_name",
    );
  if (!c) throw new Error(`credential ${credentialId} not found`);
  return c;
}

/** How long a "credential verified" e-mail waits for more verifications to join it. */
export const CREDENTIAL_BATCH_MS = 2 * 60_000;

/**
 * A credential verified. Verifications of one reviewer's credentials in the same sitting go
 * out as one e-mail: the first waits CREDENTIAL_BATCH_MS unsent, and later ones join it.
 */
export async function notifyCredentialVerified(trx: Trx, appUrl: string, credentialId: number) {
  const c = await credentialContext(trx, credentialId);
  const line = { credential: credentialName(c.kind), expiresOn: String(c.expires_on) };
  const waiting = await trx("email_outbox")
    .where({ to_user_id: c.user_id, template: "credential_verified", status: "pending" })
    .andWhere("attempts", 0)
    .andWhere("next_attempt_at", ">", sqlDateTime(new Date()))
    .forUpdate()
    .first("id", "payload");
  if (waiting) {
    const payload = (
      typeof waiting.payload === "string" ? JSON.parse(waiting.payload) : waiting.payload
    ) as TemplatePayloads["credential_verified"];
    const listed = [payload, ...(payload.more ?? [])].some(
      (m) => m.credential === line.credential && m.expiresOn === line.expiresOn,
    );
    if (!listed)
      await trx("email_outbox")
        .where({ id: waiting.id })
        .update({ payload: JSON.stringify({ ...payload, more: [...(payload.more ?? []), line] }) });
    return listed ? "duplicate" : "queued";
  }
  return enqueueEmail(trx, {
    delayMs: CREDENTIAL_BATCH_MS,
    to: { address: c.email, userId: c.user_id },
    template: "credential_verified",
    payload: {
      name: c.display_name,
      credential: credentialName(c.kind),
      expiresOn: String(c.expires_on),
      url: `${appUrl}/reviewer/credentials`,
    },
    dedupeKey: `credential-${c.id}-verified-${c.reviewed_at}`,
  });
}

export async function notifyCredentialRejected(trx: Trx, appUrl: string, credentialId: number) {
  const c = await credentialContext(trx, credentialId);
  return enqueueEmail(trx, {
    to: { address: c.email, userId: c.user_id },
    template: "credential_rejected",
    payload: {
      name: c.display_name,
      credential: credentialName(c.kind),
      reason: c.admin_reason ?? "no reason given",
      url: `${appUrl}/reviewer/credentials`,
    },
    dedupeKey: `credential-${c.id}-rejected-${c.reviewed_at}`,
  });
}

/** Credential expiring soon: one warning per credential and expiry date. True when queued. */
export async function notifyCredentialExpiring(
  trx: Trx,
  appUrl: string,
  credentialId: number,
): Promise<boolean> {
  const c = await credentialContext(trx, credentialId);
  const result = await enqueueEmail(trx, {
    to: { address: c.email, userId: c.user_id },
    template: "credential_expiring",
    payload: {
      name: c.display_name,
      credential: credentialName(c.kind),
      expiresOn: String(c.expires_on),
      url: `${appUrl}/reviewer/credentials`,
    },
    dedupeKey: `credential-${c.id}-expiring-${c.expires_on}`,
  });
  return result === "queued";
}

/**
 * New message in a thread: batched, at most one e-mail per thread and recipient every 15
 * minutes. The recipient's message_reads row is locked so two messages sent at once decide
 * the window together.
 */
export async function notifyNewMessage(
  trx: Trx,
  appUrl: string,
  messageId: number,
  now = new Date(),
) {
  const m = await trx("messages as m")
    .join("message_threads as t", "t.id", "m.thread_id")
    .join("requests as r", "r.id", "t.request_id")
    .join("projects as p", "p.id", "r.project_id")
    .join("users as s", "s.id", "m.sender_id")
    .where("m.id", messageId)
    .first(
      "m.id",
      "m.thread_id",
      "m.body_md",
      "m.sender_id",
      "t.reviewer_id",
      "r.homeowner_id",
      "r.id as request_id",
      "p.title",
      "s.display_name as sender_name",
    );
  if (!m) throw new Error(`message ${messageId} not found`);
  const toReviewer = m.sender_id === m.homeowner_id;
  // Before the homeowner accepts their quote, a reviewer learns neither their name nor the project.
  const accepted =
    !toReviewer ||
    (await trx("quotes")
      .where({ request_id: m.request_id, reviewer_id: m.reviewer_id, status: "accepted" })
      .first("id")) !== undefined;
  const recipientId = m.sender_id === m.homeowner_id ? m.reviewer_id : m.homeowner_id;
  const recipient = await trx("users")
    .where({ id: recipientId })
    .first("id", "email", "display_name");
  if (!recipient) return "opted_out" as const;
  await trx.raw("INSERT IGNORE INTO message_reads (thread_id, user_id) VALUES (?, ?)", [
    m.thread_id,
    recipientId,
  ]);
  const read = await trx("message_reads")
    .where({ thread_id: m.thread_id, user_id: recipientId })
    .forUpdate()
    .first("last_emailed_at");
  if (
    read?.last_emailed_at &&
    now.getTime() - fromSqlDateTime(read.last_emailed_at).getTime() < MESSAGE_EMAIL_WINDOW_MS
  ) {
    return "batched" as const;
  }
  const preview = String(m.body_md).replace(/\s+/g, " ").slice(0, 140);
  const result = await enqueueEmail(trx, {
    to: { address: recipient.email, userId: recipient.id },
    template: "new_message",
    payload: {
      name: recipient.display_name,
      senderName: accepted ? m.sender_name : "The homeowner",
      ...(accepted ? { projectTitle: m.title } : {}),
      preview,
      // The request page holds the conversation, for the homeowner and the reviewer alike.
      url: `${appUrl}/requests/${m.request_id}`,
    },
    dedupeKey: `message-${m.id}`,
  });
  if (result === "queued") {
    await trx("message_reads")
      .where({ thread_id: m.thread_id, user_id: recipientId })
      .update({ last_emailed_at: sqlDateTime(now) });
  }
  return result;
}

// ---------------------------------------------------------------- site visits

/** The bare address of a From line ("Loopwright <no-reply@x>" → "no-reply@x"). */
const senderAddress = (from: string) => /<([^>]+)>/.exec(from)?.[1] ?? from.trim();

/**
 * A site visit proposed, confirmed or called off: both sides get an e-mail with the calendar
 * invitation attached (one UID per job, SEQUENCE = the job's visit_sequence, so every change
 * replaces the entry their calendar already holds). Call after the visit columns are written.
 */
export async function notifyVisitChanged(
  trx: Trx,
  appUrl: string,
  jobId: number,
  change: "proposed" | "confirmed" | "declined" | "cancelled",
  timeZone: string,
) {
  const j = await jobContext(trx, jobId);
  const v = await trx("jobs")
    .where({ id: jobId })
    .first("visit_at", "visit_sequence", "visit_note");
  const start = fromSqlDateTime(String(v.visit_at));
  const when = formatWhen(start, timeZone);
  const url = `${appUrl}/jobs/${j.id}`;
  const reviewerName = j.trading_name ?? j.reviewer_name;
  const invitation = visitInvitation({
    jobId,
    sequence: Number(v.visit_sequence),
    start,
    status:
      change === "proposed" ? "TENTATIVE" : change === "confirmed" ? "CONFIRMED" : "CANCELLED",
    title: `Loopwright site visit: ${j.title}`,
    description: `Site visit by ${reviewerName} for ${j.title}. Details and changes: ${url}\nThe visitor works at height from a scaffold or tower, never a ladder alone; local rules for work at height apply.`,
    url,
    organizer: { name: "Loopwright", email: senderAddress(env().MAIL_FROM) },
    attendees: [
      { name: j.homeowner_name, email: j.homeowner_email },
      { name: reviewerName, email: j.reviewer_email },
    ],
    host: new URL(appUrl).hostname,
  });
  const people = [
    { address: j.homeowner_email, userId: j.homeowner_id, name: j.homeowner_name, reviewer: false },
    { address: j.reviewer_email, userId: j.reviewer_id, name: j.reviewer_name, reviewer: true },
  ];
  for (const p of people) {
    const base = { to: { address: p.address, userId: p.userId }, attachments: [invitation] };
    const dedupeKey = `job-${j.id}-visit-${v.visit_sequence}-${p.userId}`;
    const common = { name: p.name, projectTitle: j.title, when, url };
    if (change === "proposed")
      await enqueueEmail(trx, {
        ...base,
        template: "visit_proposed",
        payload: { ...common, mine: p.reviewer, note: v.visit_note ?? null },
        dedupeKey,
      });
    else if (change === "confirmed")
      await enqueueEmail(trx, { ...base, template: "visit_confirmed", payload: common, dedupeKey });
    else if (change === "cancelled")
      await enqueueEmail(trx, { ...base, template: "visit_cancelled", payload: common, dedupeKey });
    else
      await enqueueEmail(trx, {
        ...base,
        template: "visit_declined",
        payload: { ...common, note: String(v.visit_note ?? ""), mine: !p.reviewer },
        dedupeKey,
      });
  }
}

// ---------------------------------------------------------------- receipts

/** The receipt number printed on the page and in the e-mail for one ledger row. */
export const receiptNumber = (ledgerId: number) => `LW-${String(ledgerId).padStart(6, "0")}`;

/**
 * A receipt for a charge or a refund, to the homeowner who paid: called in the transaction that
 * wrote the ledger row (found by its idempotency key). Once per row.
 */
export async function notifyReceipt(trx: Trx, appUrl: string, ledgerKey: string) {
  const l = await trx("ledger_entries")
    .where({ idempotency_key: ledgerKey })
    .first("id", "job_id", "kind", "amount_minor", "currency", "created_at");
  if (!l || (l.kind !== "charge" && l.kind !== "refund")) return "duplicate" as const;
  const j = await jobContext(trx, Number(l.job_id));
  return enqueueEmail(trx, {
    to: { address: j.homeowner_email, userId: j.homeowner_id },
    template: "receipt",
    payload: {
      name: j.homeowner_name,
      projectTitle: j.title,
      what: l.kind === "charge" ? "Payment" : "Refund",
      number: receiptNumber(Number(l.id)),
      amount: formatMoney(Math.abs(Number(l.amount_minor)), String(l.currency)),
      date: new Intl.DateTimeFormat("en-GB", {
        dateStyle: "long",
        timeZone: env().APP_TIME_ZONE,
      }).format(fromSqlDateTime(String(l.created_at))),
      url: `${appUrl}/jobs/${j.id}/receipts/${l.id}`,
    },
    dedupeKey: `receipt-${l.id}`,
  });
}
