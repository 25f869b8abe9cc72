"use client";

import { useEffect, useRef, type ReactNode } from "react";
import { Notice } from "./card";

/**
 * The outcome of an action, and where focus goes after it: on a refusal with fields marked
 * invalid, the first of them (the notice above is the one summary, announced once); otherwise the
 * notice itself, so focus never drops to the page when the button that was pressed is disabled or
 * gone. Render it only after an action (it takes focus when it appears and when its text changes).
 */
export function ResultNotice({
  tone,
  title,
  children,
}: {
  tone: "success" | "danger" | "info" | "caution";
  title?: string;
  children: ReactNode;
}) {
  const ref = useRef<HTMLDivElement>(null);
  const text = typeof children === "string" ? children : (title ?? "");
  // biome-ignore lint/correctness/useExhaustiveDependencies: focus moves again when the outcome's text changes
  useEffect(() => {
    const box = ref.current;
    if (!box) return;
    const form = box.closest("form");
    const invalid = tone === "danger" ? form?.querySelector<HTMLElement>('[aria-invalid="true"]') : null;
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
