"use client";

import { LogoMark } from "@/components/brand/logo";
import { Button } from "@/components/ui/button";

export default function ErrorPage({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <main className="mx-auto flex min-h-[70vh] max-w-lg flex-col items-center justify-center gap-4 p-8 text-center">
      <LogoMark size={56} />
      <h1>Something snagged</h1>
      <p className="text-ink-soft">
        Blockyard could not finish showing this page. Nothing you saved was lost. If the database is restarting, try
        again in a moment.
      </p>
      {error.digest && <p className="text-xs text-ink-faint">Reference: {error.digest}</p>}
      <Button onClick={reset}>Try again</Button>
    </main>
  );
}
