/** Shapes shared by lib/data/review.ts and the client components of the review and the report. */
import type { Finding, Level } from "@/lib/calc/findings";

export const VERDICTS = [
  "sound",
  "concern",
  "unsafe",
  "not_applicable",
  "could_not_verify",
] as const;
export type Verdict = (typeof VERDICTS)[number];

export const OUTCOMES = ["ready_to_commission", "fix_before_filling", "do_not_proceed"] as const;
export type Outcome = (typeof OUTCOMES)[number];

/** A numbered mark on the sketch or a photo; x and y are fractions (0–1) of the image's width and height. */
export interface Pin {
  attachmentId: number;
  x: number;
  y: number;
  label: string;
}

/** One checklist item's answer as saved; `version` rises with every save (0 = never saved). */
export interface Answer {
  itemKey: string;
  verdict: Verdict | null;
  noteMd: string;
  pins: Pin[];
  version: number;
  updatedAt: string | null;
}

/** A change the homeowner must make, linked to the checklist items it answers. */
export interface RequiredChange {
  text: string;
  itemKeys: string[];
}

/** The report's own fields while it is a draft. */
export interface ReportDraft {
  outcome: Outcome | null;
  summaryMd: string;
  requiredChanges: RequiredChange[];
  version: number;
}

/** A sketch or photo of the project, as the review sees it. */
export interface ReviewFile {
  id: number;
  purpose: "sketch" | "photo";
  fileName: string;
  caption: string | null;
  /** The area the homeowner tagged the photo with (collector, vessel …). */
  tag: string | null;
  isImage: boolean;
  /** The checklist items the homeowner says the photo shows. */
  itemKeys: string[];
}

/** A question from the reviewer to the homeowner about one item, and the answer. */
export interface ItemRequest {
  id: number;
  itemKey: string;
  itemTitle: string;
  kind: "photo" | "fact";
  questionMd: string;
  answerMd: string | null;
  answerAttachmentId: number | null;
  answeredAt: string | null;
  createdAt: string;
}

/** A reviewer's question as the homeowner sees it on the project page. */
export interface ProjectItemRequest extends ItemRequest {
  jobId: number;
  reviewerName: string;
  /** The review is still under way, so the question can be answered. */
  open: boolean;
}

/** One checklist item with what the reviewer judges it by. */
export interface ReviewItem {
  key: string;
  title: string;
  section: string;
  check: string;
  basis: string;
  appliesWhen: string;
  /** The loop-check findings it links to, from the request's snapshot. */
  evidence: Finding[];
  /** Which photos would help, from lib/checklist/photo-guidance.ts (null when none is needed). */
  photoGuidance: string | null;
  /** Photos tagged to this item by the homeowner, then photos of the area the item concerns. */
  photoIds: number[];
  suggestedPhotoIds: number[];
}

export interface ReviewWorkspace {
  jobId: number;
  projectId: number;
  projectTitle: string;
  homeownerName: string;
  kind: "remote_check" | "site_visit";
  state: string;
  /** The report is delivered (the workspace is then read-only). */
  reportDelivered: boolean;
  questions: string;
  catalogueVersion: string;
  worst: Level;
  items: ReviewItem[];
  answers: Record<string, Answer>;
  draft: ReportDraft;
  files: ReviewFile[];
  itemRequests: ItemRequest[];
}

/** What the client refetches and saves against: the answers and the draft. */
export interface ReviewState {
  answers: Record<string, Answer>;
  draft: ReportDraft;
  itemRequests: ItemRequest[];
}

/** One item as frozen in a delivered report. */
export interface ReportItem {
  key: string;
  title: string;
  section: string;
  check: string;
  basis: string;
  verdict: Verdict | null;
  noteMd: string;
  pins: Pin[];
  evidence: Finding[];
}

export interface ReportFile {
  id: number;
  purpose: "sketch" | "photo";
  fileName: string;
  caption: string | null;
}

/** The stored, versioned snapshot of a delivered report (reports.checklist_snapshot). */
export interface ReportSnapshot {
  format: 1;
  catalogueVersion: string;
  worst: Level;
  outcome: Outcome;
  summaryMd: string;
  requiredChanges: RequiredChange[];
  items: ReportItem[];
  files: ReportFile[];
}

export interface Addendum {
  id: number;
  bodyMd: string;
  authorName: string;
  createdAt: string;
}

export interface ReportView {
  jobId: number;
  projectId: number;
  projectTitle: string;
  reviewerName: string;
  reviewerId: number;
  homeownerName: string;
  kind: "remote_check" | "site_visit";
  jobState: string;
  deliveredAt: string;
  /** False for a report delivered before snapshots were kept: its checklist was not recorded. */
  hasChecklist: boolean;
  snapshot: ReportSnapshot;
  findings: Finding[];
  addenda: Addendum[];
  viewer: "homeowner" | "reviewer" | "admin";
}
