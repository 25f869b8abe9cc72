"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { ApiError, send } from "@/lib/swr/fetcher";
import type { ClaimStatus } from "@/lib/stock";
import { Button } from "@/components/ui/button";
import { Field, Input, Select } from "@/components/ui/field";
import { ResultNotice } from "@/components/ui/result-notice";

const OUTCOME_WORDS = { accepted: "accepted", rejected: "rejected", credited: "credited" } as const;

/** The supplier's answer to a claim: accepted, rejected, or credited with the credit received. */
export function ClaimDecision({ claimId, status }: { claimId: number; status: ClaimStatus }) {
  const router = useRouter();
  const [msg, setMsg] = useState<{ tone: "success" | "danger"; text: string } | null>(null);
  const [fields, setFields] = useState<Record<string, string>>({});
  const [busy, setBusy] = useState(false);
  const outcomes = status === "open" ? (["accepted", "rejected", "credited"] as const) : (["credited"] as const);
  const id = (name: string) => `claim-${claimId}-${name}`;

  return (
    <form
      className="space-y-3"
      onSubmit={(e) => {
        e.preventDefault();
        const fd = new FormData(e.currentTarget);
        const outcome = String(fd.get("outcome")) as keyof typeof OUTCOME_WORDS;
        const credit = String(fd.get("creditReceived") ?? "").trim();
        setMsg(null);
        setFields({});
        setBusy(true);
        send(`/api/claims/${claimId}/decide`, "POST", {
          outcome,
          creditReceived: credit === "" ? null : Number(credit),
          note: String(fd.get("decisionNote") ?? "").trim() || null,
        })
          .then(() => {
            setMsg({ tone: "success", text: `Claim #${claimId} recorded as ${OUTCOME_WORDS[outcome]}.` });
            router.refresh();
          })
          .catch((err) => {
            if (err instanceof ApiError) {
              setFields(err.fields ?? {});
              setMsg({ tone: "danger", text: err.message });
            } else setMsg({ tone: "danger", text: "Nothing was changed." });
          })
          .finally(() => setBusy(false));
      }}
    >
      {msg && <ResultNotice tone={msg.tone}>{msg.text}</ResultNotice>}
      <div className="grid gap-3 sm:grid-cols-3">
        <Field label="Supplier's answer" name={id("outcome")} error={fields.outcome}>
          <Select id={id("outcome")} name="outcome" error={fields.outcome}>
            {outcomes.map((o) => (
              <option key={o} value={o}>
                {o === "credited" ? "Credited" : o === "accepted" ? "Accepted" : "Rejected"}
              </option>
            ))}
          </Select>
        </Field>
        <Field label="Credit received (USD)" name={id("creditReceived")} error={fields.creditReceived}>
          <Input
            id={id("creditReceived")}
            name="creditReceived"
            inputMode="decimal"
            autoComplete="off"
            error={fields.creditReceived}
          />
        </Field>
        <Field label="Note (optional)" name={id("decisionNote")} error={fields.note}>
          <Input id={id("decisionNote")} name="decisionNote" autoComplete="off" error={fields.note} />
        </Field>
      </div>
      <Button type="submit" tone="secondary" disabled={busy}>
        Record the answer
      </Button>
    </form>
  );
}
