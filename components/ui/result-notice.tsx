"use client";

import { useEffect, useRef, type ReactNode } from "react";
import { useAnnounce } from "./announcer";
import { Notice } from "./card";

type Tone = "success" | "danger" | "info" | "caution";

/**
 * The outcome of an action, and where focus goes after it: on a refusal with fields marked
 * invalid, the first of them (this notice is the one summary; each field names its own error
 * through aria-describedby); otherwise the notice itself, so focus never drops to the page when the
 * button that was pressed is disabled or gone. The words are said once in the page's live region.
 * Render it only after an action (it takes focus when it appears and when its text changes).
 */
export function ResultNotice({ tone, title, children }: { tone: Tone; title?: string; children: ReactNode }) {
  const ref = useRef<HTMLDivElement>(null);
  const announce = useAnnounce();
  const text = typeof children === "string" ? children : (title ?? "");
  // biome-ignore lint/correctness/useExhaustiveDependencies: focus moves again when the outcome's text changes
  useEffect(() => {
    const box = ref.current;
    if (!box) return;
    const form = box.closest("form");
    const invalid = tone === "danger" ? form?.querySelector<HTMLElement>('[aria-invalid="true"]') : null;
    announce(box.textContent ?? "");
    (invalid ?? box).focus();
  }, [tone, text]);
  return (
    <div ref={ref} tabIndex={-1} className="rounded-md focus:outline-2 focus:outline-offset-2 focus:outline-kerf">
      <Notice tone={tone} title={title}>
        {children}
      </Notice>
    </div>
  );
}

/**
 * A message that appears or changes without the person having moved (a run failing, a file
 * checked): shown in place and said in the page's live region, focus left where it is.
 */
export function LiveNotice({ tone, title, children }: { tone: Tone; title?: string; children: ReactNode }) {
  const ref = useRef<HTMLDivElement>(null);
  const announce = useAnnounce();
  const last = useRef("");
  useEffect(() => {
    const text = ref.current?.textContent ?? "";
    if (text && text !== last.current) {
      last.current = text;
      announce(text);
    }
  });
  return (
    <div ref={ref}>
      <Notice tone={tone} title={title}>
        {children}
      </Notice>
    </div>
  );
}
