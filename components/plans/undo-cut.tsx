"use client";

import { formatTime } from "@/lib/format";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { ApiError, send } from "@/lib/swr/fetcher";
import { Button } from "@/components/ui/button";
import { ResultNotice } from "@/components/ui/result-notice";

/** Undo a block's recording while the window lasts: asks first, then reverses it. */
export function UndoCut({
  runId,
  blockId,
  code,
  until,
}: {
  runId: number;
  blockId: number;
  code: string;
  until: string;
}) {
  const router = useRouter();
  const [asking, setAsking] = useState(false);
  const [busy, setBusy] = useState(false);
  const [message, setMessage] = useState<{ tone: "success" | "danger"; text: string } | null>(null);
  const time = formatTime(until);
  return (
    <div className="space-y-2">
      {message && <ResultNotice tone={message.tone}>{message.text}</ResultNotice>}
      {!asking ? (
        <Button tone="secondary" onClick={() => setAsking(true)}>
          Undo the recording of {code} (until {time})…
        </Button>
      ) : (
        <div role="alertdialog" aria-labelledby={`undo-${blockId}`} className="rounded-md border-2 border-ember p-3">
          <p id={`undo-${blockId}`} className="font-medium">
            Undo {code}? It goes back to the plan, its offcuts and uncut pieces leave stock, and its parts are owed
            again. Nothing is deleted: the stock ledger shows the reversal.
          </p>
          <div className="mt-2 flex flex-wrap gap-2">
            <Button
              disabled={busy}
              autoFocus
              onClick={async () => {
                setBusy(true);
                try {
                  await send(`/api/runs/${runId}/blocks/${blockId}/undo`, "POST");
                  setMessage({ tone: "success", text: `${code} is back in the plan, to be cut.` });
                  router.refresh();
                } catch (e) {
                  setMessage({ tone: "danger", text: e instanceof ApiError ? e.message : "Nothing was undone." });
                } finally {
                  setBusy(false);
                  setAsking(false);
                }
              }}
            >
              {busy ? "Undoing…" : `Yes, undo ${code}`}
            </Button>
            <Button tone="secondary" onClick={() => setAsking(false)}>
              Keep it
            </Button>
          </div>
        </div>
      )}
    </div>
  );
}
