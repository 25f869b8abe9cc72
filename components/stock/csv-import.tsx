"use client";

import { plural } from "@/lib/format";
import Link from "next/link";
import { useState } from "react";
import { buttonClass } from "@/components/ui/button";
import { CsvUpload } from "@/components/ui/csv-upload";

type Kind = "deliveries" | "stock-counts";

const TEMPLATES: Record<Kind, { href: string; label: string }> = {
  deliveries: { href: "/templates/deliveries.csv", label: "Download the deliveries template (CSV)" },
  "stock-counts": { href: "/templates/stock-count.csv", label: "Download the stock count template (CSV)" },
};

// The report's figures in the buyer's words.
const SUMMARY_LABELS: Record<Kind, Record<string, string>> = {
  deliveries: { deliveries: "deliveries", blocks: "blocks", volumeM3: "volume (m³)", cost: "cost" },
  "stock-counts": {
    confirmed: "blocks confirmed",
    moved: "moved",
    remeasured: "re-measured",
    missing: "missing (written off)",
  },
};

export function CsvImport() {
  const [kind, setKind] = useState<Kind>("deliveries");
  return (
    <CsvUpload
      url={`/api/imports/${kind}`}
      resetKey={kind}
      template={TEMPLATES[kind]}
      summaryLabels={SUMMARY_LABELS[kind]}
      controls={
        <label className="text-sm">
          <span className="block font-medium text-ink-soft">What it holds</span>
          <select
            value={kind}
            onChange={(e) => setKind(e.target.value as Kind)}
            className="mt-1 min-h-11 rounded-md border border-bead-strong bg-paper-raised px-3"
          >
            <option value="deliveries">Deliveries (one row per block received)</option>
            <option value="stock-counts">Stock count (one row per block counted)</option>
          </select>
        </label>
      }
      hint="Numbers take a decimal point (1.5), never a decimal comma or thousands separators; a cost may group thousands as 1,234.50. Checking changes nothing; the import then takes every row or none."
      imported={(report) => (
        <>
          {plural(report.rows, "row")} imported and written to the stock ledger.{" "}
          <Link href="/stock">See the stock list</Link>.
          <span className="mt-3 block">
            <Link className={buttonClass("secondary")} href="/stock">
              Go to stock
            </Link>
          </span>
        </>
      )}
    />
  );
}
