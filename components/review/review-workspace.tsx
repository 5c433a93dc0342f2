"use client";

import { useCallback, useMemo, useRef, useState } from "react";
import { useRouter } from "next/navigation";
import { useQuery } from "@tanstack/react-query";
import { checkDelivery } from "@/lib/checklist/delivery";
import { numberPins } from "@/lib/checklist/pins";
import {
  OUTCOME_HINTS,
  OUTCOME_LABELS,
  VERDICT_HINTS,
  VERDICT_LABELS,
} from "@/lib/checklist/verdicts";
import {
  OUTCOMES,
  VERDICTS,
  type Answer,
  type ItemRequest,
  type Outcome,
  type Pin,
  type ReportDraft,
  type RequiredChange,
  type ReviewItem,
  type ReviewState,
  type ReviewWorkspace as Workspace,
  type Verdict,
} from "@/lib/types/review";
import { NOTE_MAX, PIN_LABEL_MAX, PINS_PER_ITEM_MAX, SUMMARY_MAX } from "@/lib/validation/review";
import { Button } from "@/components/ui/button";
import { Markdown } from "@/components/ui/markdown";
import { cn } from "@/lib/cn";
import { Evidence } from "./evidence";
import { PinnedImage } from "./pinned-image";
import { VERDICT_STYLE } from "./verdict-badge";

type SaveStatus = "idle" | "saving" | "saved" | "error" | "conflict";
type AnswerFields = Pick<Answer, "verdict" | "noteMd" | "pins">;
type DraftFields = Pick<ReportDraft, "outcome" | "summaryMd" | "requiredChanges">;
const DRAFT = "__report";

interface Problem {
  status: SaveStatus;
  message?: string;
  /** The newer version someone else saved (on a 409). */
  newer?: Answer | ReportDraft;
}

const fieldsOf = (a: Answer): AnswerFields => ({
  verdict: a.verdict,
  noteMd: a.noteMd,
  pins: a.pins,
});
const draftFieldsOf = (d: ReportDraft): DraftFields => ({
  outcome: d.outcome,
  summaryMd: d.summaryMd,
  requiredChanges: d.requiredChanges,
});

async function errorOf(res: Response): Promise<{ message: string; current?: unknown }> {
  const body = (await res.json().catch(() => ({}))) as {
    error?: string;
    fieldErrors?: Record<string, string[]>;
    current?: unknown;
  };
  const details = Object.values(body.fieldErrors ?? {}).flat();
  return {
    message: [body.error ?? "Not saved.", ...details].join(" "),
    current: body.current,
  };
}

/**
 * The reviewer's workspace: the checklist by section with its evidence and photos, a verdict,
 * a note and pins per item, each change saved as it is made (one save at a time per item, each
 * based on the version the last save returned); a save refused as stale shows the newer text
 * and lets the reviewer choose. Then the report draft and delivery.
 */
export function ReviewWorkspace({ initial, canEdit }: { initial: Workspace; canEdit: boolean }) {
  const jobId = initial.jobId;
  const items = initial.items;
  const itemKeys = useMemo(() => items.map((i) => i.key), [items]);
  const [local, setLocal] = useState<Record<string, AnswerFields>>(() =>
    Object.fromEntries(Object.values(initial.answers).map((a) => [a.itemKey, fieldsOf(a)])),
  );
  const [draft, setDraft] = useState<DraftFields>(() => draftFieldsOf(initial.draft));
  const [requests, setRequests] = useState<ItemRequest[]>(initial.itemRequests);
  const [status, setStatus] = useState<Record<string, Problem>>({});
  const versions = useRef<Record<string, number>>({
    ...Object.fromEntries(Object.values(initial.answers).map((a) => [a.itemKey, a.version])),
    [DRAFT]: initial.draft.version,
  });
  const pending = useRef<Record<string, Record<string, unknown> | undefined>>({});
  const chains = useRef<Record<string, Promise<void>>>({});
  const timers = useRef<Record<string, ReturnType<typeof setTimeout>>>({});

  const inflight = useRef<Record<string, boolean>>({});
  const statusRef = useRef<Record<string, Problem>>({});
  const mark = useCallback((key: string, p: Problem) => {
    statusRef.current = { ...statusRef.current, [key]: p };
    setStatus((s) => ({ ...s, [key]: p }));
  }, []);

  /**
   * Queue a save of these fields; saves of one item run one after another. While a conflict is
   * shown, changes are kept but not sent until the reviewer chooses (`force`).
   */
  const save = useCallback(
    (key: string, patch: Record<string, unknown>, force = false) => {
      const merged = { ...pending.current[key], ...patch };
      if (!Object.keys(merged).length) return;
      pending.current[key] = merged;
      if (!force && statusRef.current[key]?.status === "conflict") return;
      mark(key, { status: "saving" });
      const url =
        key === DRAFT
          ? `/api/jobs/${jobId}/report-draft`
          : `/api/jobs/${jobId}/answers/${encodeURIComponent(key)}`;
      const run = async () => {
        const body = pending.current[key];
        if (!body) return;
        pending.current[key] = undefined;
        inflight.current[key] = true;
        try {
          const res = await fetch(url, {
            method: "PUT",
            headers: { "content-type": "application/json" },
            body: JSON.stringify({ ...body, expectedVersion: versions.current[key] ?? 0 }),
          });
          if (res.ok) {
            const saved = (await res.json()) as Answer | ReportDraft;
            versions.current[key] = saved.version;
            if (!pending.current[key]) mark(key, { status: "saved" });
            return;
          }
          const err = await errorOf(res);
          if (res.status === 409 && err.current) {
            // Keep what this tab has; the reviewer chooses.
            pending.current[key] = {
              ...body,
              ...(pending.current[key] as Record<string, unknown> | undefined),
            };
            mark(key, {
              status: "conflict",
              message: err.message,
              newer: err.current as Answer | ReportDraft,
            });
          } else {
            mark(key, { status: "error", message: err.message });
          }
        } catch {
          pending.current[key] = {
            ...body,
            ...(pending.current[key] as Record<string, unknown> | undefined),
          };
          mark(key, {
            status: "error",
            message:
              "Not saved: the connection dropped. Your text is kept here; it saves with your next change.",
          });
        } finally {
          inflight.current[key] = false;
        }
      };
      chains.current[key] = (chains.current[key] ?? Promise.resolve()).then(run);
    },
    [jobId, mark],
  );

  const saveSoon = (key: string, patch: Record<string, unknown>) => {
    pending.current[key] = { ...pending.current[key], ...patch };
    if (statusRef.current[key]?.status === "conflict") return;
    mark(key, { status: "saving" });
    clearTimeout(timers.current[key]);
    timers.current[key] = setTimeout(() => save(key, {}), 700);
  };

  const setAnswer = (key: string, patch: Partial<AnswerFields>, soon = false) => {
    setLocal((l) => ({ ...l, [key]: { ...l[key]!, ...patch } }));
    if (soon) saveSoon(key, patch);
    else save(key, patch);
  };
  const setDraftField = (patch: Partial<DraftFields>, soon = false) => {
    setDraft((d) => ({ ...d, ...patch }));
    if (soon) saveSoon(DRAFT, patch);
    else save(DRAFT, patch);
  };

  /** A conflict resolved: take the newer version, or save this tab's over it. */
  const resolve = (key: string, keepMine: boolean) => {
    const p = status[key];
    if (!p?.newer) return;
    clearTimeout(timers.current[key]);
    versions.current[key] = p.newer.version;
    if (keepMine) {
      const mine = key === DRAFT ? draft : local[key]!;
      pending.current[key] = undefined;
      save(key, { ...mine }, true);
    } else {
      pending.current[key] = undefined;
      if (key === DRAFT) setDraft(draftFieldsOf(p.newer as ReportDraft));
      else setLocal((l) => ({ ...l, [key]: fieldsOf(p.newer as Answer) }));
      mark(key, { status: "saved" });
    }
  };

  // Newer saves from another tab, and the homeowner's answers, without a reload: merged as
  // they arrive, for items this tab is not saving or holding unsaved changes for.
  const merge = (data: ReviewState) => {
    setRequests(data.itemRequests);
    const idle = (k: string) =>
      !pending.current[k] && !inflight.current[k] && statusRef.current[k]?.status !== "conflict";
    for (const a of Object.values(data.answers)) {
      if (a.version <= (versions.current[a.itemKey] ?? 0) || !idle(a.itemKey)) continue;
      versions.current[a.itemKey] = a.version;
      setLocal((l) => ({ ...l, [a.itemKey]: fieldsOf(a) }));
    }
    if (data.draft.version > (versions.current[DRAFT] ?? 0) && idle(DRAFT)) {
      versions.current[DRAFT] = data.draft.version;
      setDraft(draftFieldsOf(data.draft));
    }
  };
  useQuery({
    queryKey: ["review", jobId],
    queryFn: async (): Promise<ReviewState> => {
      const res = await fetch(`/api/jobs/${jobId}/review`);
      if (!res.ok) throw new Error((await errorOf(res)).message);
      const data = (await res.json()) as ReviewState;
      merge(data);
      return data;
    },
    refetchInterval: 20_000,
    refetchOnWindowFocus: true,
    refetchOnMount: false,
    initialData: {
      answers: initial.answers,
      draft: initial.draft,
      itemRequests: initial.itemRequests,
    },
  });

  const pins = useMemo(() => numberPins(itemKeys, (k) => local[k]?.pins), [itemKeys, local]);
  const sections = useMemo(() => {
    const out: { name: string; items: ReviewItem[] }[] = [];
    for (const item of items) {
      const last = out.at(-1);
      if (last?.name === item.section) last.items.push(item);
      else out.push({ name: item.section, items: [item] });
    }
    return out;
  }, [items]);
  const answered = (k: string) => Boolean(local[k]?.verdict);
  const done = itemKeys.filter(answered).length;
  const delivery = checkDelivery({
    itemKeys,
    verdicts: Object.fromEntries(itemKeys.map((k) => [k, local[k]?.verdict])),
    outcome: draft.outcome,
    summaryMd: draft.summaryMd,
    requiredChanges: draft.requiredChanges,
  });

  return (
    <div className="space-y-6">
      <nav
        aria-label="Progress by section"
        className="sticky top-0 z-10 rounded-card border border-slate-200 bg-white/95 p-3 shadow-sm backdrop-blur"
      >
        <p className="font-semibold" data-testid="progress">
          {done} of {itemKeys.length} items answered
        </p>
        <ul className="mt-2 flex gap-2 overflow-x-auto whitespace-nowrap pb-1 text-sm">
          {sections.map((s) => {
            const n = s.items.filter((i) => answered(i.key)).length;
            return (
              <li key={s.name}>
                <a
                  href={`#section-${slug(s.name)}`}
                  className={cn(
                    "inline-flex min-h-9 items-center gap-1 rounded-full border px-3",
                    n === s.items.length
                      ? "border-level-ok bg-level-ok-bg"
                      : "border-slate-300 bg-white",
                  )}
                >
                  {s.name}{" "}
                  <span className="tabular-nums">
                    {n}/{s.items.length}
                  </span>
                  {n === s.items.length ? <span className="sr-only">(done)</span> : null}
                </a>
              </li>
            );
          })}
          <li>
            <a
              href="#report-draft"
              className="inline-flex min-h-9 items-center rounded-full border border-copper-700 px-3 font-semibold text-copper-700"
            >
              Report and delivery
            </a>
          </li>
        </ul>
      </nav>

      {sections.map((s) => (
        <section
          key={s.name}
          id={`section-${slug(s.name)}`}
          aria-labelledby={`h-${slug(s.name)}`}
          className="scroll-mt-28 space-y-4"
        >
          <h2 id={`h-${slug(s.name)}`} className="text-2xl font-bold">
            {s.name}
          </h2>
          {s.items.map((item) => (
            <ItemCard
              key={item.key}
              item={item}
              files={initial.files}
              value={local[item.key]!}
              problem={status[item.key]}
              pins={pins}
              requests={requests.filter((r) => r.itemKey === item.key)}
              canEdit={canEdit}
              onChange={(patch, soon) => setAnswer(item.key, patch, soon)}
              onFlush={() => {
                clearTimeout(timers.current[item.key]);
                if (pending.current[item.key]) save(item.key, {});
              }}
              onResolve={(keepMine) => resolve(item.key, keepMine)}
              onAsked={(r) => setRequests((list) => [...list, r])}
              jobId={jobId}
            />
          ))}
        </section>
      ))}

      <ReportDraftPanel
        jobId={jobId}
        items={items}
        draft={draft}
        problem={status[DRAFT]}
        canEdit={canEdit}
        delivery={delivery}
        onChange={setDraftField}
        onFlush={() => {
          clearTimeout(timers.current[DRAFT]);
          if (pending.current[DRAFT]) save(DRAFT, {});
        }}
        onResolve={(keepMine) => resolve(DRAFT, keepMine)}
        saving={() =>
          Object.values(status).some((p) => p.status === "saving" || p.status === "conflict")
        }
      />
    </div>
  );
}

const slug = (s: string) => s.toLowerCase().replace(/[^a-z0-9]+/g, "-");

function SaveState({ problem, label }: { problem?: Problem; label: string }) {
  const s = problem?.status ?? "idle";
  return (
    <p
      aria-live="polite"
      className="min-h-6 text-sm"
      data-save-state={s}
      data-testid={`save-${label}`}
    >
      {s === "saving" ? <span className="text-slate-600">Saving…</span> : null}
      {s === "saved" ? <span className="font-semibold text-level-ok">✓ Saved</span> : null}
      {s === "error" ? (
        <span role="alert" className="font-semibold text-level-stop">
          {problem?.message}
        </span>
      ) : null}
      {s === "conflict" ? (
        <span className="font-semibold text-level-fix">Newer text from another tab</span>
      ) : null}
    </p>
  );
}

function ConflictBox({
  problem,
  onResolve,
  children,
}: {
  problem?: Problem;
  onResolve: (keepMine: boolean) => void;
  children: React.ReactNode;
}) {
  if (problem?.status !== "conflict") return null;
  return (
    <div
      role="alert"
      className="space-y-2 rounded-lg border-2 border-level-fix bg-level-fix-bg p-3"
      data-testid="conflict"
    >
      <p className="font-semibold">{problem.message}</p>
      <div className="rounded bg-white p-2">{children}</div>
      <div className="flex flex-wrap gap-2">
        <Button type="button" variant="secondary" onClick={() => onResolve(false)}>
          Use the newer text
        </Button>
        <Button type="button" variant="ghost" onClick={() => onResolve(true)}>
          Keep mine and save it over the newer text
        </Button>
      </div>
    </div>
  );
}

interface ItemCardProps {
  jobId: number;
  item: ReviewItem;
  files: Workspace["files"];
  value: AnswerFields;
  problem?: Problem;
  pins: ReturnType<typeof numberPins>;
  requests: ItemRequest[];
  canEdit: boolean;
  onChange: (patch: Partial<AnswerFields>, soon?: boolean) => void;
  onFlush: () => void;
  onResolve: (keepMine: boolean) => void;
  onAsked: (r: ItemRequest) => void;
}

function ItemCard(p: ItemCardProps) {
  const { item, value, files } = p;
  const images = files.filter((f) => f.isImage);
  const [pinOpen, setPinOpen] = useState(false);
  const [pinFile, setPinFile] = useState<number | null>(
    images.find((f) => f.purpose === "sketch")?.id ?? images[0]?.id ?? null,
  );
  const [pinLabel, setPinLabel] = useState("");
  const photos = [...item.photoIds, ...item.suggestedPhotoIds]
    .map((id) => files.find((f) => f.id === id))
    .filter((f): f is NonNullable<typeof f> => Boolean(f));
  const myPins = p.pins.filter((pin) => pin.itemKey === item.key);
  const newer = p.problem?.newer as Answer | undefined;
  const id = `item-${item.key}`;

  const dropPin = (x: number, y: number) => {
    if (!pinFile || value.pins.length >= PINS_PER_ITEM_MAX) return;
    const pin: Pin = {
      attachmentId: pinFile,
      x: Math.round(x * 10_000) / 10_000,
      y: Math.round(y * 10_000) / 10_000,
      label: (pinLabel.trim() || item.title).slice(0, PIN_LABEL_MAX),
    };
    p.onChange({ pins: [...value.pins, pin] });
    setPinLabel("");
  };

  return (
    <article
      id={id}
      data-item={item.key}
      aria-labelledby={`${id}-title`}
      className="scroll-mt-28 space-y-4 rounded-card border border-slate-200 bg-white p-4 shadow-sm md:p-5"
    >
      <header className="flex flex-wrap items-start justify-between gap-2">
        <div>
          <h3 id={`${id}-title`} className="text-xl font-bold">
            {item.title}
          </h3>
          <p className="mt-1">{item.check}</p>
          <p className="mt-1 text-sm text-slate-600">
            Basis: {item.basis}
            {item.appliesWhen && item.appliesWhen !== "always"
              ? ` · Applies because ${item.appliesWhen}`
              : ""}
          </p>
        </div>
        <SaveState problem={p.problem} label={item.key} />
      </header>

      {item.evidence.length ? (
        <details open className="rounded-lg bg-slate-50 p-3">
          <summary className="cursor-pointer py-3 font-semibold">From the loop check</summary>
          <div className="mt-2">
            <Evidence findings={item.evidence} />
          </div>
        </details>
      ) : null}

      {photos.length || item.photoGuidance ? (
        <div className="space-y-2">
          <p className="font-semibold">Photos</p>
          {item.photoGuidance ? (
            <p className="text-sm text-slate-600">Useful here: {item.photoGuidance}</p>
          ) : null}
          {photos.length ? (
            <ul className="flex flex-wrap gap-2">
              {photos.map((f) => (
                <li key={f.id}>
                  <a href={`/api/files/${f.id}`} target="_blank" rel="noreferrer" className="block">
                    {/* eslint-disable-next-line @next/next/no-img-element -- a private file behind our access check */}
                    <img
                      src={`/api/files/${f.id}?variant=thumbnail`}
                      alt={f.caption ?? f.fileName}
                      className="h-24 w-24 rounded object-cover"
                    />
                    <span className="block max-w-24 truncate text-xs">
                      {item.photoIds.includes(f.id) ? "Tagged" : "Same area"}:{" "}
                      {f.caption ?? f.fileName}
                    </span>
                  </a>
                </li>
              ))}
            </ul>
          ) : (
            <p className="text-sm">No photo of this yet.</p>
          )}
        </div>
      ) : null}

      <fieldset disabled={!p.canEdit} className="space-y-2">
        <legend className="font-semibold">Verdict</legend>
        <div className="flex flex-wrap gap-2">
          {VERDICTS.map((v) => {
            const { icon: Icon, className } = VERDICT_STYLE[v];
            const on = value.verdict === v;
            return (
              <label
                key={v}
                title={VERDICT_HINTS[v]}
                className={cn(
                  "inline-flex min-h-11 cursor-pointer items-center gap-2 rounded-full border-2 px-3",
                  on ? className : "border-slate-300 bg-white",
                )}
              >
                <input
                  type="radio"
                  name={`verdict-${item.key}`}
                  value={v}
                  checked={on}
                  onChange={() => p.onChange({ verdict: v as Verdict })}
                  className="sr-only"
                />
                <Icon aria-hidden className="h-5 w-5" />
                <span className={on ? "font-bold" : ""}>{VERDICT_LABELS[v]}</span>
              </label>
            );
          })}
        </div>
      </fieldset>

      <div className="space-y-1">
        <label htmlFor={`${id}-note`} className="font-semibold">
          Note{" "}
          <span className="font-normal text-slate-600">
            (Markdown, up to {NOTE_MAX.toLocaleString("en-GB")} characters)
          </span>
        </label>
        <textarea
          id={`${id}-note`}
          rows={3}
          disabled={!p.canEdit}
          value={value.noteMd}
          onChange={(e) => p.onChange({ noteMd: e.target.value }, true)}
          onBlur={p.onFlush}
          className="w-full rounded-lg border border-slate-300 p-3"
        />
        {value.noteMd.length > NOTE_MAX ? (
          <p className="text-sm font-semibold text-level-stop">
            {value.noteMd.length.toLocaleString("en-GB")} characters: a note is at most{" "}
            {NOTE_MAX.toLocaleString("en-GB")}.
          </p>
        ) : null}
      </div>

      <ConflictBox problem={p.problem} onResolve={p.onResolve}>
        {newer ? (
          <>
            <p className="text-sm">
              Verdict: {newer.verdict ? VERDICT_LABELS[newer.verdict] : "none"} ·{" "}
              {newer.pins.length} pins
            </p>
            <div className="prose prose-sm" data-testid="newer-text">
              <Markdown>{newer.noteMd || "(no note)"}</Markdown>
            </div>
          </>
        ) : null}
      </ConflictBox>

      <div className="space-y-2">
        <div className="flex flex-wrap items-center gap-3">
          <p className="font-semibold">Pins</p>
          {images.length && p.canEdit ? (
            <Button type="button" variant="secondary" onClick={() => setPinOpen((o) => !o)}>
              {pinOpen ? "Close the pin board" : "Pin on the sketch or a photo"}
            </Button>
          ) : null}
        </div>
        {myPins.length ? (
          <ol className="space-y-1">
            {myPins.map((pin, i) => (
              <li
                key={`${pin.n}`}
                className="flex flex-wrap items-center gap-2"
                data-pin-row={pin.n}
              >
                <span className="inline-flex h-7 w-7 items-center justify-center rounded-full bg-copper-700 text-sm font-bold text-white">
                  {pin.n}
                </span>
                <span>{pin.label}</span>
                <span className="text-sm text-slate-600">
                  on{" "}
                  {files.find((f) => f.id === pin.attachmentId)?.caption ??
                    files.find((f) => f.id === pin.attachmentId)?.fileName ??
                    "an image"}
                </span>
                {p.canEdit ? (
                  <Button
                    type="button"
                    variant="ghost"
                    aria-label={`Remove pin ${pin.n}`}
                    onClick={() => p.onChange({ pins: value.pins.filter((_, j) => j !== i) })}
                  >
                    Remove
                  </Button>
                ) : null}
              </li>
            ))}
          </ol>
        ) : (
          <p className="text-sm text-slate-600">No pins on this item.</p>
        )}
        {pinOpen && pinFile ? (
          <div className="space-y-2 rounded-lg border border-slate-200 p-3">
            <div className="flex flex-wrap gap-3">
              <label className="flex flex-col text-sm font-semibold">
                Image
                <select
                  value={pinFile}
                  onChange={(e) => setPinFile(Number(e.target.value))}
                  className="mt-1 min-h-11 rounded-lg border border-slate-300 px-2 font-normal"
                >
                  {images.map((f) => (
                    <option key={f.id} value={f.id}>
                      {f.purpose === "sketch" ? "Sketch" : "Photo"}: {f.caption ?? f.fileName}
                    </option>
                  ))}
                </select>
              </label>
              <label className="flex flex-1 flex-col text-sm font-semibold">
                Label for the next pin
                <input
                  value={pinLabel}
                  maxLength={PIN_LABEL_MAX}
                  onChange={(e) => setPinLabel(e.target.value)}
                  placeholder={item.title}
                  className="mt-1 min-h-11 rounded-lg border border-slate-300 px-2 font-normal"
                />
              </label>
            </div>
            <p className="text-sm text-slate-600">
              {value.pins.length >= PINS_PER_ITEM_MAX
                ? `This item has the most pins one item can have (${PINS_PER_ITEM_MAX}); remove one to add another.`
                : "Tap or click the image where the pin goes."}
            </p>
            <PinnedImage
              fileId={pinFile}
              alt="The image to pin on"
              pins={p.pins.filter((x) => x.attachmentId === pinFile)}
              highlight={[item.key]}
              onPick={dropPin}
            />
          </div>
        ) : null}
      </div>

      <ItemQuestions
        jobId={p.jobId}
        item={item}
        requests={p.requests}
        files={files}
        canEdit={p.canEdit}
        onAsked={p.onAsked}
      />
    </article>
  );
}

function ItemQuestions({
  jobId,
  item,
  requests,
  files,
  canEdit,
  onAsked,
}: {
  jobId: number;
  item: ReviewItem;
  requests: ItemRequest[];
  files: Workspace["files"];
  canEdit: boolean;
  onAsked: (r: ItemRequest) => void;
}) {
  const [open, setOpen] = useState(false);
  const [kind, setKind] = useState<"photo" | "fact">("photo");
  const [text, setText] = useState("");
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const ask = async () => {
    setBusy(true);
    setError(null);
    const res = await fetch(`/api/jobs/${jobId}/item-requests`, {
      method: "POST",
      headers: { "content-type": "application/json" },
      body: JSON.stringify({ itemKey: item.key, kind, questionMd: text }),
    }).catch(() => null);
    setBusy(false);
    if (!res) return setError("Not sent: the connection dropped. Try again.");
    if (!res.ok) return setError((await errorOf(res)).message);
    onAsked((await res.json()) as ItemRequest);
    setText("");
    setOpen(false);
  };
  return (
    <div className="space-y-2 border-t border-slate-100 pt-3">
      {requests.map((r) => (
        <div key={r.id} className="rounded-lg bg-slate-50 p-3" data-item-request={r.id}>
          <p className="text-sm font-semibold">
            You asked for {r.kind === "photo" ? "a photo" : "a fact"}: {r.questionMd}
          </p>
          {r.answeredAt ? (
            <div className="mt-2 border-l-4 border-copper-700 pl-3" data-testid="item-answer">
              <p className="text-sm text-slate-600">The homeowner answered:</p>
              {r.answerMd ? (
                <div className="prose prose-sm">
                  <Markdown>{r.answerMd}</Markdown>
                </div>
              ) : null}
              {r.answerAttachmentId ? (
                <a href={`/api/files/${r.answerAttachmentId}`} target="_blank" rel="noreferrer">
                  {/* eslint-disable-next-line @next/next/no-img-element -- a private file behind our access check */}
                  <img
                    src={`/api/files/${r.answerAttachmentId}?variant=thumbnail`}
                    alt={
                      files.find((f) => f.id === r.answerAttachmentId)?.caption ??
                      "The homeowner's photo"
                    }
                    className="mt-1 h-24 w-24 rounded object-cover"
                  />
                </a>
              ) : null}
            </div>
          ) : (
            <p className="text-sm text-slate-600">Waiting for the homeowner.</p>
          )}
        </div>
      ))}
      {canEdit ? (
        open ? (
          <div className="space-y-2">
            <fieldset className="flex flex-wrap gap-4">
              <legend className="sr-only">What you need</legend>
              {(["photo", "fact"] as const).map((k) => (
                <label key={k} className="flex min-h-11 items-center gap-2">
                  <input
                    type="radio"
                    name={`ask-${item.key}`}
                    checked={kind === k}
                    onChange={() => setKind(k)}
                    className="h-5 w-5"
                  />
                  {k === "photo" ? "A photo" : "A fact"}
                </label>
              ))}
            </fieldset>
            <label className="block text-sm font-semibold" htmlFor={`ask-${item.key}-text`}>
              What you need from the homeowner
            </label>
            <textarea
              id={`ask-${item.key}-text`}
              rows={2}
              maxLength={2000}
              value={text}
              onChange={(e) => setText(e.target.value)}
              className="w-full rounded-lg border border-slate-300 p-3"
            />
            {error ? (
              <p role="alert" className="text-sm font-semibold text-level-stop">
                {error}
              </p>
            ) : null}
            <div className="flex gap-2">
              <Button type="button" onClick={ask} disabled={busy}>
                {busy ? "Sending…" : "Send the question"}
              </Button>
              <Button type="button" variant="ghost" onClick={() => setOpen(false)}>
                Cancel
              </Button>
            </div>
          </div>
        ) : (
          <Button type="button" variant="ghost" onClick={() => setOpen(true)}>
            Ask the homeowner for a photo or a fact
          </Button>
        )
      ) : null}
    </div>
  );
}

function ReportDraftPanel({
  jobId,
  items,
  draft,
  problem,
  canEdit,
  delivery,
  onChange,
  onFlush,
  onResolve,
  saving,
}: {
  jobId: number;
  items: ReviewItem[];
  draft: DraftFields;
  problem?: Problem;
  canEdit: boolean;
  delivery: ReturnType<typeof checkDelivery>;
  onChange: (patch: Partial<DraftFields>, soon?: boolean) => void;
  onFlush: () => void;
  onResolve: (keepMine: boolean) => void;
  saving: () => boolean;
}) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const newer = problem?.newer as ReportDraft | undefined;
  const changes = draft.requiredChanges;
  const setChanges = (next: RequiredChange[], soon = false) =>
    onChange({ requiredChanges: next }, soon);
  const deliver = async () => {
    if (saving()) {
      setError("Wait until every change is saved, then deliver.");
      return;
    }
    if (
      !window.confirm(
        "Deliver the report? It is frozen once delivered; later notes go in a dated addendum.",
      )
    )
      return;
    setBusy(true);
    setError(null);
    const res = await fetch(`/api/jobs/${jobId}/deliver`, { method: "POST" }).catch(() => null);
    if (!res) {
      setBusy(false);
      return setError("Not delivered: the connection dropped. Try again.");
    }
    if (!res.ok) {
      setBusy(false);
      return setError((await errorOf(res)).message);
    }
    router.push(`/jobs/${jobId}/report`);
  };
  return (
    <section
      id="report-draft"
      aria-labelledby="report-draft-title"
      className="space-y-4 rounded-card border-2 border-copper-700 bg-white p-4 md:p-6"
    >
      <div className="flex flex-wrap items-start justify-between gap-2">
        <h2 id="report-draft-title" className="text-2xl font-bold">
          The report
        </h2>
        <SaveState problem={problem} label="report" />
      </div>
      <fieldset disabled={!canEdit} className="space-y-2">
        <legend className="font-semibold">Overall outcome</legend>
        {OUTCOMES.map((o) => (
          <label key={o} className="flex min-h-11 items-start gap-3">
            <input
              type="radio"
              name="outcome"
              value={o}
              checked={draft.outcome === o}
              onChange={() => onChange({ outcome: o as Outcome })}
              className="mt-1 h-5 w-5"
            />
            <span>
              <span className="font-semibold">{OUTCOME_LABELS[o]}</span>
              <span className="block text-sm text-slate-600">{OUTCOME_HINTS[o]}</span>
            </span>
          </label>
        ))}
      </fieldset>
      <div className="space-y-1">
        <label htmlFor="summary" className="font-semibold">
          Summary for the homeowner{" "}
          <span className="font-normal text-slate-600">
            (Markdown, up to {SUMMARY_MAX.toLocaleString("en-GB")} characters)
          </span>
        </label>
        <textarea
          id="summary"
          rows={5}
          disabled={!canEdit}
          value={draft.summaryMd}
          onChange={(e) => onChange({ summaryMd: e.target.value }, true)}
          onBlur={onFlush}
          className="w-full rounded-lg border border-slate-300 p-3"
        />
      </div>
      <div className="space-y-3">
        <p className="font-semibold">Required changes</p>
        {changes.map((c, i) => (
          <div
            key={i}
            className="space-y-2 rounded-lg border border-slate-200 p-3"
            data-change={i + 1}
          >
            <label className="block text-sm font-semibold" htmlFor={`change-${i}`}>
              Change {i + 1}: what to do
            </label>
            <input
              id={`change-${i}`}
              disabled={!canEdit}
              value={c.text}
              maxLength={500}
              onChange={(e) =>
                setChanges(
                  changes.map((x, j) => (j === i ? { ...x, text: e.target.value } : x)),
                  true,
                )
              }
              onBlur={onFlush}
              className="min-h-11 w-full rounded-lg border border-slate-300 px-3"
            />
            <div className="flex flex-wrap items-center gap-2">
              {c.itemKeys.map((k) => (
                <span
                  key={k}
                  className="inline-flex items-center gap-1 rounded-full bg-slate-100 px-3 py-1 text-sm"
                >
                  {items.find((it) => it.key === k)?.title ?? k}
                  {canEdit ? (
                    <button
                      type="button"
                      aria-label={`Unlink ${items.find((it) => it.key === k)?.title ?? k}`}
                      onClick={() =>
                        setChanges(
                          changes.map((x, j) =>
                            j === i ? { ...x, itemKeys: x.itemKeys.filter((y) => y !== k) } : x,
                          ),
                        )
                      }
                      className="ml-1 font-bold"
                    >
                      ×
                    </button>
                  ) : null}
                </span>
              ))}
              {canEdit ? (
                <select
                  aria-label={`Link change ${i + 1} to an item`}
                  value=""
                  onChange={(e) => {
                    const k = e.target.value;
                    if (k)
                      setChanges(
                        changes.map((x, j) =>
                          j === i ? { ...x, itemKeys: [...x.itemKeys, k] } : x,
                        ),
                      );
                  }}
                  className="min-h-11 rounded-lg border border-slate-300 px-2 text-sm"
                >
                  <option value="">Link to an item…</option>
                  {items
                    .filter((it) => !c.itemKeys.includes(it.key))
                    .map((it) => (
                      <option key={it.key} value={it.key}>
                        {it.section}: {it.title}
                      </option>
                    ))}
                </select>
              ) : null}
              {canEdit ? (
                <Button
                  type="button"
                  variant="ghost"
                  onClick={() => setChanges(changes.filter((_, j) => j !== i))}
                >
                  Remove this change
                </Button>
              ) : null}
            </div>
          </div>
        ))}
        {canEdit ? (
          <Button
            type="button"
            variant="secondary"
            onClick={() => setChanges([...changes, { text: "", itemKeys: [] }])}
          >
            Add a required change
          </Button>
        ) : null}
      </div>
      <ConflictBox problem={problem} onResolve={onResolve}>
        {newer ? (
          <>
            <p className="text-sm">
              Outcome: {newer.outcome ? OUTCOME_LABELS[newer.outcome] : "none"}
            </p>
            <div className="prose prose-sm" data-testid="newer-text">
              <Markdown>{newer.summaryMd || "(no summary)"}</Markdown>
            </div>
          </>
        ) : null}
      </ConflictBox>
      <div className="space-y-2 border-t border-slate-200 pt-4">
        <h3 className="text-lg font-bold">Before delivery</h3>
        {delivery.problems.length ? (
          <ul className="list-disc space-y-1 pl-6" data-testid="delivery-problems">
            {delivery.problems.map((p, i) => (
              <li key={i}>{p.message}</li>
            ))}
          </ul>
        ) : (
          <p className="font-semibold text-level-ok">✓ Everything needed is there.</p>
        )}
        {delivery.warnings.map((w, i) => (
          <p key={i} className="text-sm text-level-fix">
            {w.message}
          </p>
        ))}
        {error ? (
          <p role="alert" className="font-semibold text-level-stop">
            {error}
          </p>
        ) : null}
        {canEdit ? (
          <Button type="button" onClick={deliver} disabled={busy || !delivery.ok}>
            {busy ? "Delivering…" : "Deliver the report"}
          </Button>
        ) : null}
      </div>
    </section>
  );
}
