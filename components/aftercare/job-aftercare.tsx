import Link from "next/link";
import type { Rating } from "@/lib/types/aftercare";
import { Card } from "@/components/ui/card";
import { Markdown } from "@/components/ui/markdown";
import { Stars } from "./stars";
import { RatingForm, ReplyForm } from "./rating-forms";

/** After the report: the rating (form, or what was said and the reply) and the first-fill link. */
export function JobAftercare({
  jobId,
  projectId,
  role,
  reviewerName,
  rateable,
  firstFillOpen,
  rating,
}: {
  jobId: number;
  projectId: number;
  role: "homeowner" | "reviewer" | "admin";
  reviewerName: string;
  rateable: boolean;
  firstFillOpen: boolean;
  rating: Rating | null;
}) {
  const parts: React.ReactNode[] = [];
  if (rating) {
    parts.push(
      <Card key="rating" data-testid="job-rating">
        <h2 className="text-xl font-bold">Rating</h2>
        <p className="mt-2">
          <Stars stars={rating.stars} />
        </p>
        {rating.comment ? <p className="mt-2 whitespace-pre-line">{rating.comment}</p> : null}
        {rating.replyMd ? (
          <div className="mt-3 border-l-4 border-slate-200 pl-3">
            <p className="text-sm font-semibold">Reply from {reviewerName}</p>
            <div className="prose prose-sm max-w-none">
              <Markdown>{rating.replyMd}</Markdown>
            </div>
          </div>
        ) : role === "reviewer" ? (
          <div className="mt-3">
            <ReplyForm jobId={jobId} />
          </div>
        ) : null}
      </Card>,
    );
  } else if (rateable && role === "homeowner") {
    parts.push(
      <Card key="rate">
        <h2 className="text-xl font-bold">Rate the review</h2>
        <div className="mt-2">
          <RatingForm jobId={jobId} reviewerName={reviewerName} />
        </div>
      </Card>,
    );
  }
  if (firstFillOpen)
    parts.push(
      <Card key="first-fill">
        <h2 className="text-xl font-bold">First fill</h2>
        <p className="mt-1">
          {role === "homeowner"
            ? "Once the loop is installed and filled, record the pressures, the glycol reading and the flow: they are compared with the design, and your reviewer can countersign them."
            : "The homeowner's readings at the first fill, compared with the design; the reviewer can countersign them."}
        </p>
        <Link
          className="mt-2 inline-flex min-h-11 items-center font-semibold text-copper-700 underline"
          href={`/projects/${projectId}/first-fill`}
        >
          The first-fill record
        </Link>
      </Card>,
    );
  return parts.length ? <div className="grid gap-4 lg:grid-cols-2">{parts}</div> : null;
}
