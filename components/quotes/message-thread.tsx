"use client";

import { useState } from "react";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { Markdown } from "@/components/ui/markdown";
import type { Message } from "@/lib/types/messages";
import { Button } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";

/** One conversation on a request; new messages appear without a reload (polled every 5 s). */
export function MessageThread({
  requestId,
  reviewerId,
  title,
}: {
  requestId: number;
  reviewerId?: number;
  title: string;
}) {
  const url = `/api/requests/${requestId}/messages${reviewerId ? `?reviewer=${reviewerId}` : ""}`;
  const client = useQueryClient();
  const [text, setText] = useState("");
  const thread = useQuery({
    queryKey: ["messages", requestId, reviewerId ?? "mine"],
    queryFn: async (): Promise<Message[]> => {
      const res = await fetch(url);
      if (!res.ok)
        throw new Error(
          ((await res.json()) as { error?: string }).error ?? "Messages could not be loaded.",
        );
      return res.json();
    },
    refetchInterval: 5000,
  });
  const send = useMutation({
    mutationFn: async (body: string) => {
      const res = await fetch(url, {
        method: "POST",
        headers: { "content-type": "application/json" },
        body: JSON.stringify({ body }),
      });
      if (!res.ok)
        throw new Error(
          ((await res.json()) as { error?: string }).error ?? "The message was not sent.",
        );
    },
    onSuccess: () => {
      setText("");
      void client.invalidateQueries({ queryKey: ["messages", requestId] });
    },
  });
  return (
    <section aria-label={title} className="space-y-3">
      <h3 className="text-lg font-bold">{title}</h3>
      <p className="text-sm text-slate-600">
        Keep payment on Loopwright: payments made outside it lose the held-funds protection.
      </p>
      <ol className="max-h-80 space-y-2 overflow-y-auto" aria-live="polite">
        {(thread.data ?? []).map((m) => (
          <li
            key={m.id}
            data-message={m.id}
            className={`rounded-lg p-3 ${m.mine ? "ml-8 bg-copper-50" : "mr-8 bg-slate-100"}`}
          >
            <p className="text-xs text-slate-600">
              {m.senderName} · {m.createdAt.slice(0, 16)}
            </p>
            <div className="prose prose-sm">
              <Markdown>{m.bodyMd}</Markdown>
            </div>
          </li>
        ))}
        {thread.data?.length === 0 ? <li className="text-slate-600">No messages yet.</li> : null}
      </ol>
      {thread.isError ? (
        <p role="alert" className="text-level-stop">
          {thread.error.message}
        </p>
      ) : null}
      <form
        onSubmit={(e) => {
          e.preventDefault();
          if (text.trim()) send.mutate(text);
        }}
        className="flex flex-col gap-2"
      >
        <label htmlFor={`msg-${requestId}-${reviewerId ?? "me"}`} className="text-sm font-semibold">
          Message
          <span className="block font-normal text-slate-600">
            You can use **bold**, lists and links.
          </span>
        </label>
        <textarea
          id={`msg-${requestId}-${reviewerId ?? "me"}`}
          value={text}
          onChange={(e) => setText(e.target.value)}
          rows={3}
          maxLength={4000}
          className={inputClass}
        />
        {send.isError ? (
          <p role="alert" className="text-sm text-level-stop">
            {send.error.message}
          </p>
        ) : null}
        <Button type="submit" disabled={send.isPending} className="self-start">
          {send.isPending ? "Sending…" : "Send message"}
        </Button>
      </form>
    </section>
  );
}
