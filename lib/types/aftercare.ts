/**
 * Shapes shared by lib/data/photo-tags.ts, lib/data/ratings.ts, lib/data/first-fill.ts and the
 * client components that show them.
 */
import type { FirstFillDesign, FirstFillResult } from "@/lib/calc/first-fill";

/** One checklist item that a photo helps a reviewer judge, for the project page. */
export interface PhotoGuidanceItem {
  key: string;
  title: string;
  section: string;
  /** What to photograph. */
  photo: string;
  /** Taken at the collector: the roof-safety caution is shown beside it. */
  fromRoof: boolean;
  /** The homeowner's photos tagged to this item. */
  photoIds: number[];
}

export interface TaggablePhoto {
  id: number;
  fileName: string;
  caption: string | null;
  itemKeys: string[];
}

export interface PhotoGuidanceView {
  /** False while the description is incomplete: the checklist cannot be built yet. */
  ready: boolean;
  items: PhotoGuidanceItem[];
  /** Every item that applies to the project, for tagging (title by key). */
  taggable: { key: string; title: string }[];
  photos: TaggablePhoto[];
}

/** One homeowner's rating of a reviewer for one job, and the reviewer's reply. */
export interface Rating {
  jobId: number;
  stars: number;
  comment: string;
  createdAt: string;
  replyMd: string | null;
  repliedAt: string | null;
}

export interface RatingSummary {
  /** Mean of the stars, null with no ratings. */
  average: number | null;
  count: number;
}

export interface FirstFillRecord {
  coldFillBar: number;
  prechargeBar: number;
  hotBar: number | null;
  hotTempC: number | null;
  glycolPercentMass: number | null;
  freezePointC: number | null;
  flowLph: number | null;
  notes: string;
  recordedAt: string;
  countersignedBy: string | null;
  countersignedAt: string | null;
  countersignComment: string | null;
}

export interface FirstFillJob {
  jobId: number;
  state: string;
  reviewerId: number;
  reviewerName: string;
  /** The job's report has been delivered, so the first fill can be recorded against it. */
  open: boolean;
  record: FirstFillRecord | null;
  comparison: FirstFillResult | null;
}

export interface FirstFillPage {
  projectId: number;
  projectTitle: string;
  viewer: "homeowner" | "reviewer" | "admin";
  design: FirstFillDesign;
  jobs: FirstFillJob[];
}
