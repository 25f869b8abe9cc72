"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { ApiError, readResponse, send } from "@/lib/swr/fetcher";
import { CLAIM_REASONS, CLAIM_REASON_LABELS, type ClaimReason } from "@/lib/stock";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { Field, Input, Select } from "@/components/ui/field";
import { ResultNotice } from "@/components/ui/result-notice";

const CONTROL =
  "block w-full min-h-11 rounded-md border bg-paper-raised px-3 py-2 text-base text-ink placeholder:text-ink-faint focus:border-kerf focus:outline-none focus:ring-2 focus:ring-kerf";

/** The codes typed in one box, one per line or separated by commas or spaces. */
export function splitCodes(text: string): string[] {
  return text
    .split(/[\s,;]+/)
    .map((c) => c.trim())
    .filter(Boolean);
}

/**
 * A claim to the supplier: reason, the blocks (by code, all from one supplier), credit asked, a
 * note and photos. The claim is opened first, then the photos are sent to it.
 */
export function ClaimForm({ blocks, reason }: { blocks: string; reason: ClaimReason | null }) {
  const router = useRouter();
  const [msg, setMsg] = useState<{ tone: "success" | "danger" | "caution"; text: string } | null>(null);
  const [fields, setFields] = useState<Record<string, string>>({});
  const [busy, setBusy] = useState(false);

  async function submit(form: HTMLFormElement) {
    const fd = new FormData(form);
    const codes = splitCodes(String(fd.get("blocks") ?? ""));
    const credit = String(fd.get("creditAsked") ?? "").trim();
    setMsg(null);
    setFields({});
    setBusy(true);
    let claimId: number | null = null;
    try {
      const { claim } = await send<{ claim: { id: number; supplier: string } }>("/api/claims", "POST", {
        reason: fd.get("reason"),
        blocks: codes,
        creditAsked: credit === "" ? 0 : Number(credit),
        note: String(fd.get("note") ?? "").trim() || null,
      });
      claimId = claim.id;
      const photos = fd.getAll("photos").filter((f): f is File => typeof f !== "string" && f.size > 0);
      if (photos.length) {
        const up = new FormData();
        for (const p of photos) up.append("photos", p);
        await readResponse(
          await fetch(`/api/claims/${claim.id}/photos`, {
            method: "POST",
            headers: { accept: "application/json" },
            body: up,
          }),
        );
      }
      setMsg({
        tone: "success",
        text: `Claim #${claim.id} to ${claim.supplier} opened for ${codes.length} block${codes.length === 1 ? "" : "s"}${photos.length ? ` with ${photos.length} photo${photos.length === 1 ? "" : "s"}` : ""}.`,
      });
      form.reset();
      router.refresh();
    } catch (e) {
      const text = e instanceof ApiError ? e.message : "Nothing was saved.";
      if (e instanceof ApiError) {
        // Field errors name block lines by index (blocks.2): show them under the box.
        const f: Record<string, string> = { ...(e.fields ?? {}) };
        const blockErrors = Object.entries(f).filter(([k]) => k.startsWith("blocks."));
        if (blockErrors.length) f.blocks = blockErrors.map(([, v]) => v).join(" ");
        setFields(f);
      }
      setMsg(
        claimId
          ? { tone: "caution", text: `Claim #${claimId} was opened, but its photos were not stored: ${text}` }
          : { tone: "danger", text },
      );
      if (claimId) router.refresh();
    } finally {
      setBusy(false);
    }
  }

  return (
    <Card title="New claim to a supplier" className="no-print">
      <form
        className="space-y-3"
        onSubmit={(e) => {
          e.preventDefault();
          void submit(e.currentTarget);
        }}
      >
        {msg && <ResultNotice tone={msg.tone}>{msg.text}</ResultNotice>}
        <div className="grid gap-3 md:grid-cols-2">
          <Field
            label="Blocks (codes)"
            name="blocks"
            error={fields.blocks}
            hint="One per line, or separated by commas. The supplier is the one that delivered them."
          >
            <textarea
              id="blocks"
              name="blocks"
              rows={3}
              defaultValue={blocks}
              aria-invalid={fields.blocks ? true : undefined}
              aria-describedby={fields.blocks ? "blocks-error" : undefined}
              className={`${CONTROL} ${fields.blocks ? "border-ember" : "border-bead-strong"}`}
            />
          </Field>
          <div className="space-y-3">
            <Field label="Reason" name="reason" error={fields.reason}>
              <Select name="reason" defaultValue={reason ?? "under_density"} error={fields.reason}>
                {CLAIM_REASONS.map((r) => (
                  <option key={r} value={r}>
                    {CLAIM_REASON_LABELS[r]}
                  </option>
                ))}
              </Select>
            </Field>
            <Field label="Credit asked (USD)" name="creditAsked" error={fields.creditAsked}>
              <Input name="creditAsked" inputMode="decimal" autoComplete="off" error={fields.creditAsked} />
            </Field>
          </div>
        </div>
        <Field label="Note to the supplier (optional)" name="note" error={fields.note}>
          <Input name="note" autoComplete="off" error={fields.note} />
        </Field>
        <Field label="Photos (optional, JPEG, PNG or WebP)" name="photos" error={fields.photos}>
          <input
            id="photos"
            name="photos"
            type="file"
            accept="image/jpeg,image/png,image/webp"
            multiple
            className="block min-h-11 w-full text-[15px]"
          />
        </Field>
        <Button type="submit" disabled={busy}>
          Open the claim
        </Button>
      </form>
    </Card>
  );
}
