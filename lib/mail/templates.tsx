/**
 * Every e-mail Loopwright sends, each written once as content (subject, heading, paragraphs,
 * an action link, whether the safety line belongs) and rendered to both a plain-text and an
 * HTML part from that one definition. The HTML is rendered with react-email's components and
 * renderer (@react-email/components, @react-email/render); the plain text is written here.
 */
import {
  Body,
  Button,
  Container,
  Head,
  Heading,
  Html,
  Link,
  Preview,
  Section,
  Text,
} from "@react-email/components";
import { render } from "@react-email/render";
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
      p.chosenAnother
        ? `Hello ${p.name}, the homeowner chose another quote for ${p.projectTitle}.`
        : `Hello ${p.name}, the homeowner declined your quote for ${p.projectTitle}.`,
      ...(p.reason ? [`Their reason: “${p.reason}”`] : []),
      "Your messages with them stay readable on the request. New requests arrive on the board every day.",
    ],
    action: { label: "See the request", url: p.url },
  }),
  payment_received: (p) => ({
    subject: `Payment held for ${p.projectTitle}`,
    heading: "The payment is held",
    paragraphs: [
      `${p.amount} is held by Loopwright for ${p.projectTitle}. It is released to the reviewer only after the report is delivered, when the homeowner releases it or the dispute window closes.`,
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
      p.mine
        ? `You proposed to visit for ${p.projectTitle} on ${p.when}. The homeowner is asked to confirm it; the attached invitation is marked tentative until then.`
        : `The reviewer proposes to visit for ${p.projectTitle} on ${p.when}. Confirm it, or ask for another time, on the job page. The attached invitation is marked tentative until you confirm.`,
      ...(p.note ? [`Note: “${p.note}”`] : []),
      "The visitor works at height: a scaffold or tower, never a ladder alone. Local rules for work at height apply.",
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
  visit_declined: (p) => ({
    subject: `Another site visit time asked for: ${p.projectTitle}`,
    heading: "Another visit time is needed",
    paragraphs: [
      p.mine
        ? `You asked for another time than ${p.when} for ${p.projectTitle}. The attached update takes the visit off your calendar until a new time is confirmed.`
        : `The homeowner asks for another time than ${p.when} for ${p.projectTitle}. Propose a new time on the job page. The attached update takes the old time off your calendar.`,
      `Their note: “${p.note}”`,
    ],
    action: { label: "Open the job", url: p.url },
  }),
  visit_cancelled: (p) => ({
    subject: `Site visit cancelled: ${p.projectTitle}`,
    heading: "The site visit is off",
    paragraphs: [
      `The job for ${p.projectTitle} is cancelled, so the site visit on ${p.when} will not take place. The attached update takes it off your calendar.`,
    ],
    action: { label: "Open the job", url: p.url },
  }),
  receipt: (p) => ({
    subject: `Receipt ${p.number}: ${p.what.toLowerCase()} for ${p.projectTitle}`,
    heading: `${p.what} receipt ${p.number}`,
    paragraphs: [
      `Hello ${p.name}, this is your receipt for ${p.projectTitle}.`,
      `${p.what}: ${p.amount}, on ${p.date}.`,
      "The receipt page can be printed or saved as a PDF.",
    ],
    action: { label: "Open the receipt", url: p.url },
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
    paragraphs: [`${p.amount} for ${p.projectTitle} is on its way to your payout account.`],
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
    subject: p.more?.length
      ? `${p.more.length + 1} credentials verified`
      : `Credential verified: ${p.credential}`,
    heading: p.more?.length ? "Credentials verified" : "Credential verified",
    paragraphs: [
      `Hello ${p.name}, your ${p.credential} is verified until ${p.expiresOn}.`,
      ...(p.more ?? []).map((m) => `Your ${m.credential} is verified until ${m.expiresOn}.`),
    ],
    action: { label: "Open your credentials", url: p.url },
  }),
  credential_rejected: (p) => ({
    subject: `Credential rejected: ${p.credential}`,
    heading: "Credential rejected",
    paragraphs: [
      `Hello ${p.name}, an admin rejected your ${p.credential}.`,
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
  item_requested: (p) => ({
    subject: `Your reviewer asks about ${p.projectTitle}`,
    heading: `${p.reviewerName} needs ${p.kind === "photo" ? "a photo" : "a detail"}`,
    paragraphs: [
      `About “${p.itemTitle}”: “${p.question}”`,
      "Answer on your project page, in words or with a photo you add there. Take roof and collector photos only from a safe place: the ground, a window, the loft or a scaffold.",
    ],
    action: { label: "Answer the question", url: p.url },
    safety: true,
  }),
};

const COLORS = { copper: "#9d4f25", slate: "#0f172a", muted: "#475569", sun: "#f8c537" };

/**
 * The one layout every e-mail shares, built from react-email's components, which render to the
 * table markup mail clients agree on (Outlook included), in our own look: a white card with a
 * copper rule under the name, one action button, and the safety line where it belongs.
 */
function EmailLayout({ content }: { content: Content }) {
  return (
    <Html lang="en">
      <Head />
      <Preview>{content.paragraphs[0] ?? content.heading}</Preview>
      <Body
        style={{
          margin: 0,
          background: "#f8fafc",
          fontFamily: "Inter, Arial, sans-serif",
          color: COLORS.slate,
        }}
      >
        <Container
          style={{
            maxWidth: 560,
            margin: "24px auto",
            background: "#ffffff",
            borderRadius: 12,
            border: "1px solid #e2e8f0",
          }}
        >
          <Section
            style={{
              padding: "20px 28px",
              borderBottom: `4px solid ${COLORS.copper}`,
              fontWeight: 700,
              fontSize: 20,
            }}
          >
            Loopwright
          </Section>
          <Section style={{ padding: "24px 28px", fontSize: 16, lineHeight: 1.6 }}>
            <Heading as="h1" style={{ fontSize: 22, margin: "0 0 12px" }}>
              {content.heading}
            </Heading>
            {content.paragraphs.map((p) => (
              <Text key={p} style={{ fontSize: 16, lineHeight: 1.6, margin: "0 0 12px" }}>
                {p}
              </Text>
            ))}
            {content.action ? (
              <Section style={{ margin: "20px 0" }}>
                <Button
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
                </Button>
              </Section>
            ) : null}
            {content.action ? (
              <Text style={{ fontSize: 13, color: COLORS.muted }}>
                Or open this link:{" "}
                <Link href={content.action.url} style={{ color: COLORS.copper }}>
                  {content.action.url}
                </Link>
              </Text>
            ) : null}
            {content.safety ? (
              <Text
                style={{
                  fontSize: 13,
                  color: COLORS.muted,
                  borderLeft: `4px solid ${COLORS.sun}`,
                  paddingLeft: 10,
                }}
              >
                {SAFETY_LINE}
              </Text>
            ) : null}
          </Section>
        </Container>
      </Body>
    </Html>
  );
}

export interface RenderedEmail {
  subject: string;
  text: string;
  html: string;
}

/** Render a template with its payload to subject, text and HTML. */
export async function renderEmail<K extends TemplateName>(
  template: K,
  payload: TemplatePayloads[K],
): Promise<RenderedEmail> {
  const content = (CONTENT[template] as (p: TemplatePayloads[K]) => Content)(payload);
  const text = [
    content.heading,
    "",
    ...content.paragraphs.flatMap((p) => [p, ""]),
    ...(content.action ? [`${content.action.label}: ${content.action.url}`, ""] : []),
    ...(content.safety ? [SAFETY_LINE, ""] : []),
    "— Loopwright",
  ].join("\n");
  const html = await render(<EmailLayout content={content} />);
  return { subject: content.subject, text, html };
}

export function isTemplateName(name: string): name is TemplateName {
  return name in CONTENT;
}
