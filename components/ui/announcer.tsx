"use client";

import { createContext, useCallback, useContext, useEffect, useRef, type ReactNode } from "react";

/**
 * The page's one live region (WCAG 2.1 SC 4.1.3, status messages). Results of actions, a search's
 * totals and a run's change of state are said here, once, in words; nothing else on a page is a
 * live region, so a screen reader never hears eight alerts at once. It sits outside the page's
 * content and is visually hidden.
 */
const AnnounceContext = createContext<(text: string) => void>(() => {});

export function Announcer({ children }: { children: ReactNode }) {
  const host = useRef<HTMLDivElement>(null);
  const region = useRef<HTMLDivElement | null>(null);
  const timer = useRef<ReturnType<typeof setTimeout> | null>(null);
  // The region lives in a closed shadow root of its host: screen readers hear it like any live
  // region, but it is not a second copy of the page's words for text searches (a test's or a
  // browser's find-in-page) — the notice in the page stays the one place the words are written.
  // The host carries the last words said in data-said, for tests to read.
  useEffect(() => {
    const el = host.current;
    if (!el || region.current) return;
    const root = el.attachShadow({ mode: "closed" });
    const r = document.createElement("div");
    r.setAttribute("role", "status");
    r.setAttribute("aria-live", "polite");
    r.setAttribute("aria-atomic", "true");
    root.append(r);
    region.current = r;
  }, []);
  const announce = useCallback((next: string) => {
    const said = next.replace(/\s+/g, " ").trim();
    const r = region.current;
    if (!said || !r) return;
    // Cleared first, so the same words said twice in a row are heard twice.
    r.textContent = "";
    if (timer.current) clearTimeout(timer.current);
    timer.current = setTimeout(() => {
      r.textContent = said;
      host.current?.setAttribute("data-said", said);
    }, 60);
  }, []);
  useEffect(
    () => () => {
      if (timer.current) clearTimeout(timer.current);
    },
    [],
  );
  return (
    <AnnounceContext.Provider value={announce}>
      {children}
      <div ref={host} id="page-announcer" className="sr-only" />
    </AnnounceContext.Provider>
  );
}

export function useAnnounce(): (text: string) => void {
  return useContext(AnnounceContext);
}
