"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { ApiError, send } from "@/lib/swr/fetcher";
import { Button } from "@/components/ui/button";
import { ResultNotice } from "@/components/ui/result-notice";

export interface LibraryChoice {
  id: number;
  kit: string | null;
  name: string;
  defaultQuantity: number;
  sizeText: string;
}

/** Tick library parts, set how many, add them to the job in one go. */
export function AddFromLibrary({ jobId, parts }: { jobId: number; parts: LibraryChoice[] }) {
  const router = useRouter();
  const [qty, setQty] = useState<Record<number, string>>({});
  const [msg, setMsg] = useState<{ tone: "success" | "danger"; text: string } | null>(null);
  const [busy, setBusy] = useState(false);
  const kits = [...new Set(parts.map((p) => p.kit ?? "No kit"))];
  const chosen = Object.entries(qty).filter(([, q]) => q.trim() !== "");

  async function add() {
    setBusy(true);
    setMsg(null);
    try {
      const items = chosen.map(([id, q]) => ({ libraryPartId: Number(id), quantity: Number(q) }));
      await send(`/api/jobs/${jobId}/parts`, "POST", { items });
      setMsg({ tone: "success", text: `${items.length} part${items.length === 1 ? "" : "s"} added from the library.` });
      setQty({});
      router.refresh();
    } catch (e) {
      if (e instanceof ApiError) {
        const first = Object.entries(e.fields ?? {})[0];
        const idx = first ? Number(first[0].split(".")[1]) : NaN;
        const part = Number.isFinite(idx) ? parts.find((p) => p.id === Number(chosen[idx]?.[0])) : undefined;
        setMsg({ tone: "danger", text: first ? `${part ? `${part.name}: ` : ""}${first[1]}` : e.message });
      }
    } finally {
      setBusy(false);
    }
  }

  if (!parts.length)
    return <p className="text-sm text-ink-soft">The library is empty. Add reusable parts on the Part library page.</p>;
  return (
    <div className="space-y-3">
      {msg && <ResultNotice tone={msg.tone}>{msg.text}</ResultNotice>}
      <p className="text-sm text-ink-soft">Enter how many of each to add; leave the rest empty.</p>
      {kits.map((kit) => (
        <div key={kit}>
          <h3 className="mb-1 text-sm font-semibold">{kit}</h3>
          <ul className="divide-y divide-bead/60">
            {parts
              .filter((p) => (p.kit ?? "No kit") === kit)
              .map((p) => (
                <li key={p.id} className="flex items-center justify-between gap-3 py-1.5">
                  <span className="text-sm">
                    {p.name} <span className="text-xs text-ink-faint">{p.sizeText}</span>
                  </span>
                  <input
                    aria-label={`How many ${p.name}`}
                    inputMode="numeric"
                    placeholder={String(p.defaultQuantity)}
                    value={qty[p.id] ?? ""}
                    onChange={(e) => setQty((s) => ({ ...s, [p.id]: e.target.value }))}
                    className="min-h-11 w-20 rounded-md border border-bead-strong bg-paper-raised px-2 text-right"
                  />
                </li>
              ))}
          </ul>
        </div>
      ))}
      <Button onClick={add} disabled={busy || !chosen.length}>
        Add {chosen.length || ""} from the library
      </Button>
    </div>
  );
}
