"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { ApiError, send } from "@/lib/swr/fetcher";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { ResultNotice } from "@/components/ui/result-notice";
import type { Vec3 } from "@/lib/nesting";

interface Props {
  blockId: number;
  code: string;
  location: string;
  size: Vec3;
  canMove: boolean;
  canCorrect: boolean;
  inStock: boolean;
}

/** Move, re-measure or write off a block. Each asks the server, which checks the role again. */
export function BlockActions({ blockId, code, location, size, canMove, canCorrect, inStock }: Props) {
  const router = useRouter();
  const [msg, setMsg] = useState<{ tone: "success" | "danger"; text: string } | null>(null);
  const [fields, setFields] = useState<Record<string, string>>({});

  async function run(fn: () => Promise<unknown>, ok: string) {
    setMsg(null);
    setFields({});
    try {
      await fn();
      setMsg({ tone: "success", text: ok });
      router.refresh();
    } catch (e) {
      if (e instanceof ApiError) {
        setFields(e.fields ?? {});
        setMsg({ tone: "danger", text: e.message });
      } else setMsg({ tone: "danger", text: "Nothing was changed." });
    }
  }

  if (!inStock || (!canMove && !canCorrect)) return null;
  const input = "min-h-11 w-full rounded-md border border-bead-strong bg-paper-raised px-3";
  return (
    <Card title="Change this block" className="no-print">
      {msg && (
        <div className="mb-3">
          <ResultNotice tone={msg.tone}>{msg.text}</ResultNotice>
        </div>
      )}
      <div className="grid gap-5 lg:grid-cols-3">
        {canMove && (
          <form
            className="space-y-2"
            onSubmit={(e) => {
              e.preventDefault();
              const loc = String(new FormData(e.currentTarget).get("location") ?? "");
              void run(() => send(`/api/blocks/${blockId}`, "PATCH", { location: loc }), `${code} moved to ${loc}.`);
            }}
          >
            <label className="block text-sm font-medium text-ink-soft" htmlFor="location">
              Move to
            </label>
            <input id="location" name="location" defaultValue={location} className={input} />
            {fields.location && <p className="text-sm text-ember">{fields.location}</p>}
            <Button type="submit" tone="secondary">
              Move
            </Button>
          </form>
        )}
        {canCorrect && (
          <form
            className="space-y-2"
            onSubmit={(e) => {
              e.preventDefault();
              const fd = new FormData(e.currentTarget);
              const s = ["x", "y", "z"].map((a) => Number(fd.get(a)));
              void run(
                () => send(`/api/blocks/${blockId}/adjust`, "POST", { size: s, reason: fd.get("reason") }),
                `${code} re-measured; the ledger records the change.`,
              );
            }}
          >
            <p className="text-sm font-medium text-ink-soft">Re-measure (mm)</p>
            <div className="grid grid-cols-3 gap-2">
              {(["x", "y", "z"] as const).map((a, i) => (
                <input
                  key={a}
                  name={a}
                  aria-label={["Length", "Width", "Height"][i]}
                  inputMode="decimal"
                  defaultValue={size[i]}
                  className={input}
                />
              ))}
            </div>
            {["size.0", "size.1", "size.2"].map(
              (k) =>
                fields[k] && (
                  <p key={k} className="text-sm text-ember">
                    {fields[k]}
                  </p>
                ),
            )}
            <input
              name="reason"
              placeholder="Why (e.g. shrank after curing)"
              aria-label="Reason for re-measuring"
              className={input}
            />
            {fields.reason && <p className="text-sm text-ember">{fields.reason}</p>}
            <Button type="submit" tone="secondary">
              Save measurement
            </Button>
          </form>
        )}
        {canCorrect && (
          <form
            className="space-y-2"
            onSubmit={(e) => {
              e.preventDefault();
              const reason = new FormData(e.currentTarget).get("scrapReason");
              if (!window.confirm(`Write off ${code}? It leaves stock for good.`)) return;
              void run(() => send(`/api/blocks/${blockId}/scrap`, "POST", { reason }), `${code} written off.`);
            }}
          >
            <label className="block text-sm font-medium text-ink-soft" htmlFor="scrapReason">
              Write off
            </label>
            <input id="scrapReason" name="scrapReason" placeholder="Why (e.g. water damage)" className={input} />
            {fields.reason && <p className="text-sm text-ember">{fields.reason}</p>}
            <Button type="submit" tone="danger">
              Write off
            </Button>
          </form>
        )}
      </div>
    </Card>
  );
}
