"use client";

import { Markdown } from "@/components/ui/markdown";
import { ActionForm } from "@/components/ui/action-form";
import type { ProjectFile } from "@/lib/types/projects";
import type { ProjectItemRequest } from "@/lib/types/review";
import type { ActionState } from "@/lib/types/action";

/**
 * The reviewer's open questions about single checklist items, on the homeowner's project page:
 * answer in words, or with a photo added under "Sketch and photos".
 */
export function ReviewerQuestions({
  projectId,
  questions,
  photos,
  answer,
}: {
  projectId: number;
  questions: ProjectItemRequest[];
  photos: ProjectFile[];
  answer: (prev: ActionState, formData: FormData) => Promise<ActionState>;
}) {
  if (!questions.length) return null;
  const open = questions.filter((q) => q.open && !q.answeredAt);
  return (
    <section
      id="reviewer-questions"
      aria-labelledby="reviewer-questions-title"
      className="space-y-3 rounded-card border-2 border-copper-700 bg-white p-5"
    >
      <h2 id="reviewer-questions-title" className="text-xl font-bold">
        Your reviewer asks{open.length ? ` (${open.length} to answer)` : ""}
      </h2>
      <p className="text-sm text-slate-600">
        Take roof and collector photos only from a safe place: the ground, a window, the loft or a
        scaffold with edge protection. Add a photo under &ldquo;Sketch and photos&rdquo;, then
        choose it here.
      </p>
      <ul className="space-y-3">
        {questions.map((q) => (
          <li key={q.id} className="rounded-lg bg-slate-50 p-3" data-question={q.id}>
            <p className="text-sm text-slate-600">
              {q.reviewerName} · about &ldquo;{q.itemTitle}&rdquo; ·{" "}
              {q.kind === "photo" ? "a photo" : "a fact"}
            </p>
            <div className="prose prose-sm">
              <Markdown>{q.questionMd}</Markdown>
            </div>
            {q.answeredAt ? (
              <p className="mt-1 text-sm font-semibold text-level-ok">
                ✓ Answered{q.answerMd ? `: ${q.answerMd}` : " with a photo"}
              </p>
            ) : q.open ? (
              <ActionForm
                action={answer}
                fields={{ itemRequestId: q.id, projectId }}
                submitLabel="Send the answer"
                pendingLabel="Sending…"
                variant="primary"
                className="mt-2 space-y-2"
              >
                <label className="block text-sm font-semibold" htmlFor={`answer-${q.id}`}>
                  Your answer
                </label>
                <textarea
                  id={`answer-${q.id}`}
                  name="answerMd"
                  rows={2}
                  maxLength={4000}
                  className="w-full rounded-lg border border-slate-300 p-3"
                />
                {photos.length ? (
                  <label className="block text-sm font-semibold">
                    A photo (optional)
                    <select
                      name="attachmentId"
                      defaultValue=""
                      className="mt-1 block min-h-11 w-full rounded-lg border border-slate-300 px-2 font-normal"
                    >
                      <option value="">No photo</option>
                      {photos.map((f) => (
                        <option key={f.id} value={f.id}>
                          {f.caption ?? f.fileName}
                        </option>
                      ))}
                    </select>
                  </label>
                ) : null}
              </ActionForm>
            ) : (
              <p className="mt-1 text-sm text-slate-600">The review is finished.</p>
            )}
          </li>
        ))}
      </ul>
    </section>
  );
}
