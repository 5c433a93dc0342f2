/**
 * Every e-mail Loopwright sends, each written once as content (subject, heading, paragraphs,
 * an action link, whether the safety line belongs) and rendered to both a plain-text and an
 * HTML part from that one definition. The HTML is rendered from React components.
 */
import { renderToStaticMarkup } from "react-dom/server";
import type { TemplateName, TemplatePayloads } from "./kinds";

export type { TemplateName, TemplatePayloads } from "./kinds";

export const SAFETY_LINE =
  "Loopwright is advisory: local building codes, the manufacturer's instructions and licensed practice take precedence. Never open or work on a hot solar loop.";

interface Content {
  subject: string;
  heading: string;
  paragraphs: string[];
  action?: { label: string; url: string };
  safety?: boolean;
}

const CONTENT: { [K in TemplateName]: (p: TemplatePayloads[K]) => Content } = {
  verify_email: (p) => ({
    subject: "Confirm your e-mail address",
    heading: `Welcome to Loopwright, ${p.name}`,
    paragraphs: [
      "Please confirm this is your address. The link works once and expires in 24 hours.",
      "If you did not sign up, ignore this message.",
    ],
    action: { label: "Confirm my address", url: p.url },
  }),
  reset_password: (p) => ({
    subject: "Reset your Loopwright password",
    heading: "Reset your password",
    paragraphs: [
      `Hello ${p.name}, someone asked to reset the password for this address. The link works once and expires in 1 hour.`,
      "If it was not you, ignore this message: your password stays as it is.",
    ],
    action: { label: "Choose a new password", url: p.url },
  }),
  sign_in_failures: (p) => ({
    subject: "Failed sign-ins on your Loopwright account",
    heading: "Someone is trying to sign in to your account",
    paragraphs: [
      `Hello ${p.name}, there have been ${p.count} or more sign-ins with a wrong password on your account today.`,
      "If it was you, nothing needs doing. If not, your account is still safe while the password is strong; choose a new one to be sure. Sign-ins from your own network are not blocked by these attempts.",
    ],
    action: { label: "Choose a new password", url: p.url },
  }),
  new_quote: (p) => ({
    subject: `New quote for ${p.projectTitle}`,
    heading: "You have a new quote",
    paragraphs: [
      `${p.reviewerName} quoted ${p.price} to review ${p.projectTitle}.`,
      "Compare quotes and accept one when you are ready. Pay only through Loopwright: payments outside it lose the held-funds protection.",
    ],
    action: { label: "Compare quotes", url: p.url },
  }),
  quote_accepted: (p) => ({
    subject: `Your quote for ${p.projectTitle} was accepted`,
    heading: "Your quote was accepted",
    paragraphs: [
      `Hello ${p.name}, the homeowner accepted your quote of ${p.price}. You will hear from us as soon as the payment is held, and then you can start the review.`,
    ],
    action: { label: "Open the job", url: p.url },
  }),
  quote_declined: (p) => ({
    subject: `Your quote for ${p.projectTitle} was not chosen`,
    heading: "Your quote was not chosen",
    paragraphs: [
      `Hello ${p.name}, the homeowner chose another quote for ${p.projectTitle}.`,
      ...(p.reason ? [`Their note: “${p.reason}”`] : []),
      "New requests arrive on the board every day.",
    ],
    action: { label: "Open the board", url: p.url },
  }),
  payment_received: (p) => ({
    subject: `Payment held for ${p.projectTitle}`,
    heading: "The payment is held",
    paragraphs: [
      `${p.amount} is held by Loopwright for ${p.projectTitle}. It is released to the reviewer only when the report is delivered and you release it, or the dispute window closes.`,
    ],
    action: { label: "Open the job", url: p.url },
  }),
  refund_issued: (p) => ({
    subject: `Refund for ${p.projectTitle}`,
    heading: "Your refund is on its way",
    paragraphs: [
      `${p.amount} for ${p.projectTitle} is refunded to the card you paid with. Banks usually show it within a few working days.`,
      "This e-mail is your receipt for the refund.",
    ],
    action: { label: "Open the job", url: p.url },
  }),
  payout_account_ready: (p) => ({
    subject: "Your payout account is ready",
    heading: "Your payout account is ready",
    paragraphs: [
      "Payments for the reviews you deliver can now be released to you, less the platform fee.",
    ],
    action: { label: "See your earnings", url: p.url },
  }),
  visit_proposed: (p) => ({
    subject: `Site visit proposed: ${p.projectTitle}`,
    heading: "A site visit time is proposed",
    paragraphs: [
      `The reviewer proposes to visit for ${p.projectTitle} on ${p.when}. Confirm it, or ask for another time, on the job page.`,
    ],
    action: { label: "Open the job", url: p.url },
    safety: true,
  }),
  visit_confirmed: (p) => ({
    subject: `Site visit confirmed: ${p.projectTitle}`,
    heading: "The site visit is booked",
    paragraphs: [
      `The site visit for ${p.projectTitle} is on ${p.when}. The calendar invitation is attached. Roof work needs a scaffold or tower, never a ladder alone.`,
    ],
    action: { label: "Open the job", url: p.url },
    safety: true,
  }),
  review_started: (p) => ({
    subject: `Review started: ${p.projectTitle}`,
    heading: "Your review has started",
    paragraphs: [
      `${p.reviewerName} has started reviewing ${p.projectTitle}. They may message you with questions.`,
    ],
    action: { label: "Open the job", url: p.url },
    safety: true,
  }),
  report_delivered: (p) => ({
    subject: `Report delivered: ${p.projectTitle}`,
    heading: "Your report is ready",
    paragraphs: [
      `The review of ${p.projectTitle} is delivered. Outcome: ${p.outcome}.`,
      `Read it, then release the payment or open a dispute by ${p.releaseBy}. With no action the payment is released then.`,
    ],
    action: { label: "Read the report", url: p.url },
    safety: true,
  }),
  funds_released: (p) => ({
    subject: `Payment released for ${p.projectTitle}`,
    heading: "The payment is released",
    paragraphs: [`${p.amount} for ${p.projectTitle} is on its way to your connected account.`],
    action: { label: "Open the job", url: p.url },
  }),
  dispute_opened: (p) => ({
    subject: `Dispute opened: ${p.projectTitle}`,
    heading: "A dispute was opened",
    paragraphs: [
      `A dispute was opened on ${p.projectTitle}: “${p.reason}”`,
      "The payment stays held until an admin settles it.",
    ],
    action: { label: "Open the dispute", url: p.url },
  }),
  dispute_settled: (p) => ({
    subject: `Dispute settled: ${p.projectTitle}`,
    heading: "The dispute is settled",
    paragraphs: [`The dispute on ${p.projectTitle} is settled: ${p.resolution}.`],
    action: { label: "Open the job", url: p.url },
  }),
  credential_verified: (p) => ({
    subject: `Credential verified: ${p.credential}`,
    heading: "Credential verified",
    paragraphs: [`Hello ${p.name}, your ${p.credential} is verified until ${p.expiresOn}.`],
    action: { label: "Open your credentials", url: p.url },
  }),
  credential_rejected: (p) => ({
    subject: `Credential not accepted: ${p.credential}`,
    heading: "Credential not accepted",
    paragraphs: [
      `Hello ${p.name}, we could not verify your ${p.credential}.`,
      `Reason: ${p.reason}`,
      "You can upload new evidence at any time.",
    ],
    action: { label: "Open your credentials", url: p.url },
  }),
  credential_expiring: (p) => ({
    subject: `Credential expiring on ${p.expiresOn}: ${p.credential}`,
    heading: "A credential expires soon",
    paragraphs: [
      `Hello ${p.name}, your ${p.credential} expires on ${p.expiresOn}. Upload the renewed one before then to keep quoting.`,
    ],
    action: { label: "Renew it", url: p.url },
  }),
  new_message: (p) => ({
    subject: p.projectTitle
      ? `New message about ${p.projectTitle}`
      : "New message about your quote",
    heading: `${p.senderName} sent you a message`,
    paragraphs: [
      `“${p.preview}”`,
      "Keep payments on Loopwright: payments outside it lose the held-funds protection.",
    ],
    action: { label: "Reply", url: p.url },
  }),
};

const COLORS = { copper: "#9d4f25", slate: "#0f172a", muted: "#475569", sun: "#f8c537" };

function EmailLayout({ content }: { content: Content }) {
  return (
    <html lang="en">
      <body
        style={{
          margin: 0,
          background: "#f8fafc",
          fontFamily: "Inter, Arial, sans-serif",
          color: COLORS.slate,
        }}
      >
        <table role="presentation" width="100%" cellPadding={0} cellSpacing={0}>
          <tbody>
            <tr>
              <td align="center" style={{ padding: "24px 12px" }}>
                <table
                  role="presentation"
                  width="560"
                  cellPadding={0}
                  cellSpacing={0}
                  style={{ background: "#ffffff", borderRadius: 12, border: "1px solid #e2e8f0" }}
                >
                  <tbody>
                    <tr>
                      <td
                        style={{
                          padding: "20px 28px",
                          borderBottom: `4px solid ${COLORS.copper}`,
                          fontWeight: 700,
                          fontSize: 20,
                        }}
                      >
                        Loopwright
                      </td>
                    </tr>
                    <tr>
                      <td style={{ padding: "24px 28px", fontSize: 16, lineHeight: 1.6 }}>
                        <h1 style={{ fontSize: 22, margin: "0 0 12px" }}>{content.heading}</h1>
                        {content.paragraphs.map((p) => (
                          <p key={p} style={{ margin: "0 0 12px" }}>
                            {p}
                          </p>
                        ))}
                        {content.action ? (
                          <p style={{ margin: "20px 0" }}>
                            <a
                              href={content.action.url}
                              style={{
                                background: COLORS.copper,
                                color: "#ffffff",
                                padding: "12px 20px",
                                borderRadius: 8,
                                textDecoration: "none",
                                fontWeight: 700,
                              }}
                            >
                              {content.action.label}
                            </a>
                          </p>
                        ) : null}
                        {content.action ? (
                          <p style={{ fontSize: 13, color: COLORS.muted }}>
                            Or open this link: {content.action.url}
                          </p>
                        ) : null}
                        {content.safety ? (
                          <p
                            style={{
                              fontSize: 13,
                              color: COLORS.muted,
                              borderLeft: `4px solid ${COLORS.sun}`,
                              paddingLeft: 10,
                            }}
                          >
                            {SAFETY_LINE}
                          </p>
                        ) : null}
                      </td>
                    </tr>
                  </tbody>
                </table>
              </td>
            </tr>
          </tbody>
        </table>
      </body>
    </html>
  );
}

export interface RenderedEmail {
  subject: string;
  text: string;
  html: string;
}

/** Render a template with its payload to subject, text and HTML. */
export function renderEmail<K extends TemplateName>(
  template: K,
  payload: TemplatePayloads[K],
): RenderedEmail {
  const content = (CONTENT[template] as (p: TemplatePayloads[K]) => Content)(payload);
  const text = [
    content.heading,
    "",
    ...content.paragraphs.flatMap((p) => [p, ""]),
    ...(content.action ? [`${content.action.label}: ${content.action.url}`, ""] : []),
    ...(content.safety ? [SAFETY_LINE, ""] : []),
    "— Loopwright",
  ].join("\n");
  const html = "<!doctype html>" + renderToStaticMarkup(<EmailLayout content={content} />);
  return { subject: content.subject, text, html };
}

export function isTemplateName(name: string): name is TemplateName {
  return name in CONTENT;
}
