"use client";

import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { ApiError, send } from "@/lib/swr/fetcher";
import { HOLD_LABELS, HOLD_REASONS, type HoldReason } from "@/lib/stock";
import { Button, buttonClass } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Field, Input, Select } from "@/components/ui/field";
import { ResultNotice } from "@/components/ui/result-notice";

interface Props {
  blockId: number;
  code: string;
  /** The hold the block is under, or null when it is free. */
  hold: HoldReason | null;
  /** May put a free block on hold (buyer, cutter). */
  canHold: boolean;
  /** May release a held block and claim from the supplier (buyer). */
  canRelease: boolean;
}

/**
 * Hold a suspect block out of usable stock, or release it again (re-weighed, or with a note saying
 * why it may be used). The server checks the role and the block's state again.
 */
export function HoldActions({ blockId, code, hold, canHold, canRelease }: Props) {
  const router = useRouter();
  const [msg, setMsg] = useState<{ tone: "success" | "danger"; text: string } | null>(null);
  const [fields, setFields] = useState<Record<string, string>>({});
  const [busy, setBusy] = useState(false);

  async function run(fn: () => Promise<unknown>, ok: string) {
    setMsg(null);
    setFields({});
    setBusy(true);
    try {
      await fn();
      setMsg({ tone: "success", text: ok });
      router.refresh();
    } catch (e) {
      if (e instanceof ApiError) {
        setFields(e.fields ?? {});
        setMsg({ tone: "danger", text: e.message });
      } else setMsg({ tone: "danger", text: "Nothing was changed." });
    } finally {
      setBusy(false);
    }
  }

  const notice = msg && <ResultNotice tone={msg.tone}>{msg.text}</ResultNotice>;

  if (hold) {
    if (!canRelease) return null;
    return (
      <Card title="Release from hold" className="no-print">
        <form
          className="space-y-3"
          onSubmit={(e) => {
            e.preventDefault();
            const fd = new FormData(e.currentTarget);
            const w = String(fd.get("weightKg") ?? "").trim();
            const note = String(fd.get("releaseNote") ?? "").trim();
            void run(
              () =>
                send(`/api/blocks/${blockId}/release`, "POST", {
                  weightKg: w === "" ? null : Number(w.replace(",", ".")),
                  note: note || null,
                }),
              `${code} is released: back in usable stock, on hand and free to plan.`,
            );
          }}
        >
          {notice}
          <p className="text-[15px] text-ink-soft">
            Release {code} only when it is fit to cut: weighed again after conditioning, or accepted as it is.
          </p>
          <div className="grid gap-3 sm:grid-cols-2">
            <Field label="New weight, kg (optional)" name="weightKg" error={fields.weightKg}>
              <Input name="weightKg" inputMode="decimal" autoComplete="off" error={fields.weightKg} />
            </Field>
            <Field label="Note (needed if the density is still off)" name="releaseNote" error={fields.note}>
              <Input name="releaseNote" autoComplete="off" error={fields.note} />
            </Field>
          </div>
          <div className="flex flex-wrap gap-3">
            <Button type="submit" disabled={busy}>
              Release to stock
            </Button>
            <Link className={buttonClass("secondary")} href={`/claims?blocks=${encodeURIComponent(code)}`}>
              Claim from the supplier
            </Link>
          </div>
        </form>
      </Card>
    );
  }

  if (!canHold) return null;
  return (
    <Card title="Put on hold" className="no-print">
      <form
        className="space-y-3"
        onSubmit={(e) => {
          e.preventDefault();
          const fd = new FormData(e.currentTarget);
          const reason = String(fd.get("holdReason") ?? "");
          const note = String(fd.get("holdNote") ?? "").trim();
          void run(
            () => send(`/api/blocks/${blockId}/hold`, "POST", { reason, note: note || null }),
            `${code} is on hold (${HOLD_LABELS[reason as HoldReason] ?? reason}): out of on-hand stock and planning until the buyer releases it.`,
          );
        }}
      >
        {notice}
        <p className="text-[15px] text-ink-soft">
          A suspect block stays out of on-hand stock, reorder sums and planning until the buyer releases it.
        </p>
        <div className="grid gap-3 sm:grid-cols-2">
          <Field label="Why" name="holdReason" error={fields.reason}>
            <Select name="holdReason" defaultValue="wet" error={fields.reason}>
              {HOLD_REASONS.map((r) => (
                <option key={r} value={r}>
                  {HOLD_LABELS[r][0]!.toUpperCase() + HOLD_LABELS[r].slice(1)}
                </option>
              ))}
            </Select>
          </Field>
          <Field label="Note (optional)" name="holdNote" error={fields.note}>
            <Input
              name="holdNote"
              autoComplete="off"
              placeholder="e.g. water in the core at the saw"
              error={fields.note}
            />
          </Field>
        </div>
        <Button type="submit" tone="secondary" disabled={busy}>
          Put on hold
        </Button>
      </form>
    </Card>
  );
}
