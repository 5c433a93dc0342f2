/**
 * The payments fake's own HTML pages: the hosted checkout, the payout account setup, a payout
 * account's summary (what a login link opens) and an overview of the fake's state. Plain
 * pages in our own simple look, each labelled as a local test stand-in.
 */
import type { Account, CheckoutSession, EventRecord, Transfer } from "./types";

export const escapeHtml = (s: string) =>
  s.replace(
    /[&<>"']/g,
    (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;", "'": "&#39;" })[c]!,
  );

/** Minor units shown in the currency's own format. */
export function money(minor: number, currency: string): string {
  const fmt = new Intl.NumberFormat("en-GB", {
    style: "currency",
    currency: currency.toUpperCase(),
  });
  const digits = fmt.resolvedOptions().maximumFractionDigits ?? 2;
  return fmt.format(minor / 10 ** digits);
}

const STYLE = `
body{font-family:system-ui,sans-serif;margin:0;background:#f4f4f0;color:#1c2321}
main{max-width:34rem;margin:2rem auto;background:#fff;border:1px solid #d6d6cf;border-radius:.5rem;padding:1.5rem 2rem}
main.wide{max-width:60rem}
.stand-in{background:#24453f;color:#fff;padding:.6rem 1rem;font-size:.9rem;text-align:center;letter-spacing:.02em}
h1{font-size:1.4rem;margin:.2rem 0 1rem}
.amount{font-size:2rem;font-weight:600;margin:.5rem 0 1rem}
table{border-collapse:collapse;width:100%;margin:.5rem 0 1rem}
td,th{padding:.4rem .3rem;border-bottom:1px solid #e6e6e0;text-align:left;vertical-align:top}
td.num,th.num{text-align:right}
button{font:inherit;padding:.7rem 1rem;border-radius:.4rem;border:1px solid #24453f;cursor:pointer;margin:.3rem .3rem .3rem 0}
button.primary{background:#24453f;color:#fff}
button.secondary{background:#fff;color:#24453f}
.notice{border-left:4px solid #a33a2a;background:#fbefec;padding:.7rem 1rem;margin:1rem 0}
.ok{border-left:4px solid #2f6b3a;background:#edf6ee;padding:.7rem 1rem;margin:1rem 0}
.muted{color:#5d6662;font-size:.9rem}
a{color:#24453f}
code{font-size:.85rem}
`;

function page(title: string, body: string, wide = false): string {
  return `<!doctype html><html lang="en"><head><meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(title)} (local test stand-in)</title><style>${STYLE}</style></head><body>
<div class="stand-in" role="note">LOCAL TEST STAND-IN for the payment service. No real card is used and no real money moves.</div>
<main${wide ? ' class="wide"' : ""}>${body}</main></body></html>`;
}

export function messagePage(title: string, text: string, link?: { href: string; label: string }) {
  return page(
    title,
    `<h1>${escapeHtml(title)}</h1><p>${escapeHtml(text)}</p>${
      link ? `<p><a href="${escapeHtml(link.href)}">${escapeHtml(link.label)}</a></p>` : ""
    }`,
  );
}

export function checkoutPage(s: CheckoutSession, declined: boolean): string {
  const rows = s._line_items
    .map(
      (li) =>
        `<tr><td>${escapeHtml(li.description)}${li.quantity > 1 ? ` × ${li.quantity}` : ""}</td><td class="num">${escapeHtml(money(li.amount_total, li.currency))}</td></tr>`,
    )
    .join("");
  const back = s.cancel_url
    ? `<p><a href="${escapeHtml(s.cancel_url)}">Cancel and go back</a></p>`
    : "";
  if (s.status === "complete")
    return page(
      "Test checkout",
      `<h1>Test checkout</h1><div class="ok">This checkout has been paid.</div>
<p><a href="${escapeHtml(successUrl(s))}">Continue</a></p>`,
    );
  if (s.status === "expired")
    return page(
      "Test checkout",
      `<h1>Test checkout</h1><div class="notice">This checkout has expired; nothing was charged.</div>${back}`,
    );
  return page(
    "Test checkout",
    `<h1>Test checkout</h1>
<div class="amount" data-testid="amount">${escapeHtml(money(s.amount_total, s.currency))}</div>
<table><tbody>${rows}</tbody></table>
${
  declined
    ? `<div class="notice" role="alert"><strong>Card declined.</strong> The declining test card was refused and nothing was charged. You can try again.</div>`
    : ""
}
<form method="post" action="/_fake/checkout/${encodeURIComponent(s.id)}/pay">
<button class="primary" type="submit" name="card" value="ok">Pay with a test card</button>
<button class="secondary" type="submit" name="card" value="decline">Use a declining card</button>
</form>
${back}`,
  );
}

export function successUrl(s: CheckoutSession): string {
  return s.success_url.replace(/\{CHECKOUT_SESSION_ID\}/g, s.id);
}

export function connectPage(a: Account, linkId: string): string {
  const done = a.details_submitted;
  return page(
    "Complete payout account setup",
    `<h1>Complete payout account setup</h1>
<p>${a.email ? `Payout account for ${escapeHtml(a.email)}.` : "A new payout account."}</p>
${
  done
    ? `<div class="ok">Setup is already complete: this account can receive transfers.</div>`
    : `<p>In this stand-in, one click stands for giving identity and bank details. Afterwards the account can receive transfers and payouts.</p>`
}
<form method="post" action="/_fake/connect/${encodeURIComponent(a.id)}">
<input type="hidden" name="link" value="${escapeHtml(linkId)}">
<button class="primary" type="submit" name="action" value="complete">Complete payout account setup</button>
<button class="secondary" type="submit" name="action" value="leave">Leave setup unfinished</button>
</form>`,
  );
}

export function dashboardPage(a: Account, transfers: Transfer[], balance: Map<string, number>) {
  const rows = transfers
    .map(
      (t) =>
        `<tr><td>${escapeHtml(new Date(t.created * 1000).toISOString().slice(0, 16).replace("T", " "))}</td><td>${escapeHtml(t.description ?? "Transfer from the platform")}</td><td class="num">${escapeHtml(money(t.amount, t.currency))}</td></tr>`,
    )
    .join("");
  const bal = [...balance].map(([c, n]) => money(n, c)).join(", ") || money(0, a.default_currency);
  return page(
    "Payout account",
    `<h1>Payout account</h1>
${a.email ? `<p>${escapeHtml(a.email)}</p>` : ""}
<p>Setup: ${a.details_submitted ? "complete" : "not finished"} · Transfers: ${a.payouts_enabled ? "enabled" : "not enabled"}</p>
<p>Received in total: <strong>${escapeHtml(bal)}</strong></p>
<table><thead><tr><th>When (UTC)</th><th>Description</th><th class="num">Amount</th></tr></thead>
<tbody>${rows || '<tr><td colspan="3">No transfers yet.</td></tr>'}</tbody></table>`,
    true,
  );
}

export function overviewPage(input: {
  sessions: CheckoutSession[];
  events: EventRecord[];
  balance: Map<string, number>;
  webhookUrl: string | null;
}) {
  const bal = [...input.balance].map(([c, n]) => money(n, c)).join(", ") || "nothing yet";
  const sessions = input.sessions
    .slice(-20)
    .reverse()
    .map(
      (s) =>
        `<tr><td><a href="/_fake/checkout/${encodeURIComponent(s.id)}"><code>${escapeHtml(s.id)}</code></a></td><td>${escapeHtml(s.status)} / ${escapeHtml(s.payment_status)}</td><td class="num">${escapeHtml(money(s.amount_total, s.currency))}</td></tr>`,
    )
    .join("");
  const events = input.events
    .slice(-30)
    .reverse()
    .map(
      (r) =>
        `<tr><td><code>${escapeHtml(r.event.id)}</code></td><td>${escapeHtml(r.event.type)}</td><td>${escapeHtml(r.delivery)} (${r.attempts.length} attempt${r.attempts.length === 1 ? "" : "s"})</td></tr>`,
    )
    .join("");
  return page(
    "Payments stand-in",
    `<h1>Payments stand-in</h1>
<p>Platform balance available: <strong>${escapeHtml(bal)}</strong></p>
<p class="muted">Webhooks go to ${input.webhookUrl ? `<code>${escapeHtml(input.webhookUrl)}</code>` : "nowhere (delivery is off)"}.</p>
<h2>Recent checkouts</h2><table><tbody>${sessions || "<tr><td>None yet.</td></tr>"}</tbody></table>
<h2>Recent events</h2><table><tbody>${events || "<tr><td>None yet.</td></tr>"}</tbody></table>`,
    true,
  );
}
