import { Camera, CircleCheck, CircleDashed, TriangleAlert } from "lucide-react";
import { ROOF_PHOTO_CAUTION } from "@/lib/checklist/photo-guidance";
import type { PhotoGuidanceView } from "@/lib/types/aftercare";
import { Card } from "@/components/ui/card";
import { PhotoTagForm } from "./photo-tag-form";

/**
 * Photo guidance on the project page, before any reviewer is involved: which photo each
 * applicable check needs, which still have none, the roof-safety caution, and per photo the
 * checks it shows.
 */
export function PhotoGuidance({
  projectId,
  guidance,
}: {
  projectId: number;
  guidance: PhotoGuidanceView;
}) {
  if (!guidance.ready)
    return (
      <Card>
        <h2 className="text-xl font-bold">Photos a reviewer will want</h2>
        <p className="mt-2">
          Finish the description: the list of photos follows from the checks that apply to your
          system.
        </p>
      </Card>
    );
  const missing = guidance.items.filter((i) => i.photoIds.length === 0);
  const names = new Map(guidance.photos.map((p) => [p.id, p.caption ?? p.fileName]));
  const sections: [string, typeof guidance.items][] = [];
  for (const i of guidance.items) {
    const last = sections.at(-1);
    if (last && last[0] === i.section) last[1].push(i);
    else sections.push([i.section, [i]]);
  }
  return (
    <Card aria-labelledby="photo-guidance-title">
      <h2 id="photo-guidance-title" className="text-xl font-bold">
        Photos a reviewer will want
      </h2>
      <p className="mt-1 text-slate-700">
        Each check below is easier to judge from a photo. Upload photos above, then say which checks
        each one shows.{" "}
        <strong data-testid="photo-missing-count">
          {missing.length === 0
            ? "Every check has a photo."
            : `${missing.length} of ${guidance.items.length} checks still have no photo.`}
        </strong>
      </p>
      <p
        role="note"
        className="mt-3 flex gap-2 rounded-lg border-2 border-sun-400 bg-amber-50 p-3 text-sm"
      >
        <TriangleAlert aria-hidden className="mt-0.5 h-5 w-5 shrink-0 text-copper-700" />
        <span>
          <strong>Roof photos: only from a safe place.</strong> {ROOF_PHOTO_CAUTION} Never lean out
          from the roof edge or a ladder top for a better angle.
        </span>
      </p>
      <ul className="mt-4 space-y-4" aria-label="Photos each check needs">
        {sections.map(([section, items]) => (
          <li key={section}>
            <h3 className="font-bold text-slate-800">{section}</h3>
            <ul className="divide-y divide-slate-100">
              {items.map((i) => {
                const has = i.photoIds.length > 0;
                return (
                  <li
                    key={i.key}
                    className="flex gap-3 py-2.5"
                    data-guidance={i.key}
                    data-has-photo={has}
                  >
                    {has ? (
                      <CircleCheck aria-hidden className="mt-1 h-5 w-5 shrink-0 text-level-ok" />
                    ) : (
                      <CircleDashed aria-hidden className="mt-1 h-5 w-5 shrink-0 text-slate-400" />
                    )}
                    <div>
                      <p className="font-semibold">
                        {i.title}{" "}
                        <span className="text-sm font-normal text-slate-600">
                          ·{" "}
                          {has
                            ? `photo: ${i.photoIds.map((id) => names.get(id)).join(", ")}`
                            : "no photo yet"}
                        </span>
                      </p>
                      <p className="text-sm text-slate-700">
                        <Camera aria-hidden className="mr-1 inline h-4 w-4" />
                        {i.photo}
                      </p>
                      {i.fromRoof ? (
                        <p className="text-sm font-semibold text-copper-700">
                          Taken at the collector: from the ground, a window, the loft or a guarded
                          scaffold only.
                        </p>
                      ) : null}
                    </div>
                  </li>
                );
              })}
            </ul>
          </li>
        ))}
      </ul>
      {guidance.photos.length ? (
        <div className="mt-4">
          <h3 className="text-lg font-bold">Tag your photos</h3>
          <ul className="mt-2 grid gap-4 sm:grid-cols-2">
            {guidance.photos.map((p) => (
              <li key={p.id} className="rounded-card border border-slate-200 p-3">
                <div className="mb-2 flex items-center gap-3">
                  {/* eslint-disable-next-line @next/next/no-img-element -- private files come from our access-checked route */}
                  <img
                    src={`/api/files/${p.id}?variant=thumbnail`}
                    alt={p.caption ?? p.fileName}
                    className="h-16 w-16 rounded object-cover"
                  />
                  <span className="font-semibold">{p.caption ?? p.fileName}</span>
                </div>
                <PhotoTagForm projectId={projectId} photo={p} items={guidance.taggable} />
              </li>
            ))}
          </ul>
        </div>
      ) : (
        <p className="mt-3 text-sm text-slate-600">Upload a photo to tag it to these checks.</p>
      )}
    </Card>
  );
}
