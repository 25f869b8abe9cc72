"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { ApiError, send } from "@/lib/swr/fetcher";
import { Button } from "@/components/ui/button";
import { ResultNotice } from "@/components/ui/result-notice";

/** Approve (reserves the stock), release (gives it back) and re-plan what is still owed. */
export function RunActions({
  runId,
  status,
  owes,
  canApprove = true,
}: {
  runId: number;
  status: string;
  owes: boolean;
  canApprove?: boolean;
}) {
  const router = useRouter();
  const [msg, setMsg] = useState<{ tone: "success" | "danger"; text: string } | null>(null);
  const [busy, setBusy] = useState(false);
  async function act(path: string, ok: string, go?: (body: { id?: number }) => string) {
    setBusy(true);
    setMsg(null);
    try {
      const body = await send<{ id?: number }>(`/api/runs/${runId}/${path}`, "POST");
      setMsg({ tone: "success", text: ok });
      if (go) router.push(go(body));
      else router.refresh();
    } catch (e) {
      setMsg({ tone: "danger", text: e instanceof ApiError ? e.message : "Nothing was changed." });
    } finally {
      setBusy(false);
    }
  }
  return (
    <div className="space-y-3">
      {msg && <ResultNotice tone={msg.tone}>{msg.text}</ResultNotice>}
      <div className="flex flex-wrap gap-2">
        {status === "done" && canApprove && (
          <Button disabled={busy} onClick={() => act("approve", "Approved: the blocks are earmarked for this plan.")}>
            Approve and earmark the stock
          </Button>
        )}
        {status === "approved" && (
          <Button
            tone="secondary"
            disabled={busy}
            onClick={() =>
              window.confirm("Release the blocks not cut yet and cancel this plan?") &&
              act("release", "Released: the blocks are free again.")
            }
          >
            Release the stock
          </Button>
        )}
        {owes && ["done", "approved", "closed"].includes(status) && (
          <Button
            tone="secondary"
            disabled={busy}
            onClick={() => act("replan", "A new plan for the parts still owed is on its way.", (b) => `/plans/${b.id}`)}
          >
            Re-plan the parts still owed
          </Button>
        )}
      </div>
    </div>
  );
}
