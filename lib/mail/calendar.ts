/**
 * The site visit as a calendar invitation (RFC 5545 / iTIP RFC 5546), written by the `ics`
 * package. One visit keeps one UID for its whole life; each change raises SEQUENCE, so a
 * calendar that already holds the visit replaces it instead of adding a second one.
 */
import { createEvent } from "ics";

export interface VisitInvitation {
  jobId: number;
  /** The job's visit_sequence after the change; goes out as SEQUENCE. */
  sequence: number;
  start: Date;
  /** Two hours unless said otherwise (common practice for a domestic system survey). */
  minutes?: number;
  status: "TENTATIVE" | "CONFIRMED" | "CANCELLED";
  title: string;
  description: string;
  url: string;
  organizer: { name: string; email: string };
  attendees: { name: string; email: string }[];
  /** The app's host, for the UID (stable per job). */
  host: string;
}

export interface MailAttachment {
  filename: string;
  contentType: string;
  content: string;
}

/** The visit's UID: the same for every update of one job's visit. */
export const visitUid = (jobId: number, host: string) => `site-visit-${jobId}@${host}`;

export function visitInvitation(v: VisitInvitation): MailAttachment {
  const method = v.status === "CANCELLED" ? "CANCEL" : "REQUEST";
  const { error, value } = createEvent({
    productId: "loopwright/site-visit",
    method,
    uid: visitUid(v.jobId, v.host),
    sequence: v.sequence,
    start: v.start.getTime(),
    startInputType: "utc",
    startOutputType: "utc",
    duration: { minutes: v.minutes ?? 120 },
    title: v.title,
    description: v.description,
    url: v.url,
    status: v.status,
    organizer: v.organizer,
    attendees: v.attendees.map((a) => ({
      ...a,
      rsvp: false,
      partstat: "ACCEPTED",
      role: "REQ-PARTICIPANT",
    })),
  });
  if (error || !value) throw error ?? new Error("the calendar invitation could not be written");
  return {
    filename: "site-visit.ics",
    contentType: `text/calendar; charset=utf-8; method=${method}`,
    content: value,
  };
}
