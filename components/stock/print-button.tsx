"use client";

import { Button } from "@/components/ui/button";

export function PrintButton({ label = "Print labels" }: { label?: string }) {
  return (
    <Button onClick={() => window.print()}>
      <svg
        aria-hidden
        viewBox="0 0 24 24"
        className="size-5"
        fill="none"
        stroke="currentColor"
        strokeWidth="1.8"
        strokeLinejoin="round"
      >
        <path d="M7 9V4h10v5M7 17H4v-7h16v7h-3M7 14h10v6H7z" />
      </svg>
      {label}
    </Button>
  );
}
