"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { ApiError, send } from "@/lib/swr/fetcher";
import { Button, buttonClass } from "@/components/ui/button";

import { Field, Input } from "@/components/ui/field";
import type { PoStatus } from "@/lib/purchasing/orders";
import { ResultNotice } from "@/components/ui/result-notice";

/** What the buyer can do with an order in its present state; the server refuses the rest (409). */
export function PoActions({
  id,
  status,
  supplierEmail,
}: {
  id: number;
  status: PoStatus;
  supplierEmail: string | null;
}) {
  const router = useRouter();
  const [msg, setMsg] = useState<{ tone: "success" | "danger"; text: string } | null>(null);
  const [asking, setAsking] = useState<"cancel" | "close" | null>(null);
  const [reason, setReason] = useState("");
  const [busy, setBusy] = useState(false);
  const act = async (path: string, body: object, done: string) => {
    setBusy(true);
    try {
      await send(`/api/purchase-orders/${id}/${path}`, "POST", body);
      setMsg({ tone: "success", text: done });
      setAsking(null);
      router.refresh();
    } catch (e) {
      if (e instanceof ApiError)
        setMsg({
          tone: "danger",
          text: [e.message, ...Object.values(e.fields ?? {})].filter((v, i, a) => a.indexOf(v) === i).join(" "),
        });
    } finally {
      setBusy(false);
    }
  };
  return (
    <div className="space-y-3">
      {msg && <ResultNotice tone={msg.tone}>{msg.text}</ResultNotice>}
      <div className="flex flex-wrap gap-2">
        {(status === "draft" || status === "sent") && supplierEmail && (
          <Button
            disabled={busy}
            onClick={() => act("send", { email: true }, `Order e-mailed to ${supplierEmail} with the CSV attached.`)}
          >
            {status === "draft" ? "E-mail to supplier" : "E-mail again"}
          </Button>
        )}
        {status === "draft" && (
          <Button tone="secondary" disabled={busy} onClick={() => act("send", { email: false }, "Marked as sent.")}>
            Mark sent (no e-mail)
          </Button>
        )}
        {(status === "sent" || status === "part_received") && (
          <Link className={buttonClass("primary")} href={`/purchasing/orders/${id}/receive`}>
            Receive against this order
          </Link>
        )}
        {status === "part_received" && (
          <Button tone="secondary" disabled={busy} onClick={() => setAsking("close")}>
            Close short
          </Button>
        )}
        {(status === "draft" || status === "sent") && (
          <Button tone="danger" disabled={busy} onClick={() => setAsking("cancel")}>
            Cancel order
          </Button>
        )}
        <a className={buttonClass("secondary")} href={`/api/purchase-orders/${id}/export`} download>
          Export CSV
        </a>
      </div>
      {asking && (
        <form
          className="flex flex-wrap items-end gap-2"
          onSubmit={(e) => {
            e.preventDefault();
            void act(asking, { reason }, asking === "cancel" ? "Order cancelled." : "Order closed short.");
          }}
        >
          <div className="min-w-64 flex-1">
            <Field label={asking === "cancel" ? "Why cancel?" : "Why close it short?"} name="reason">
              <Input name="reason" value={reason} onChange={(e) => setReason(e.target.value)} />
            </Field>
          </div>
          <Button type="submit" tone={asking === "cancel" ? "danger" : "primary"} disabled={busy}>
            {asking === "cancel" ? "Cancel the order" : "Close the order"}
          </Button>
          <Button tone="quiet" onClick={() => setAsking(null)}>
            Back
          </Button>
        </form>
      )}
    </div>
  );
}
