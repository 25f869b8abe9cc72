"use client";

import { plural } from "@/lib/format";
import { useEffect, useState, type ReactNode } from "react";
import { useAnnounce } from "./announcer";
import { Button } from "./button";
import { Card } from "./card";
import { ResultNotice } from "./result-notice";
import type { ImportReport } from "@/db/queries/imports";

/** The server's check of a file, as its query module types it (a type-only import: erased from the client bundle). */
export type CsvReport = ImportReport;

/** Sends the file with XHR so the bar can show upload progress, then the server's check. */
function upload(
  url: string,
  file: File,
  commit: boolean,
  onProgress: (f: number) => void,
): Promise<{ status: number; body: CsvReport }> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open(
      "POST",
      `${url}${url.includes("?") ? "&" : "?"}commit=${commit ? 1 : 0}&name=${encodeURIComponent(file.name)}`,
    );
    xhr.setRequestHeader("content-type", "text/csv");
    xhr.upload.onprogress = (e) => e.lengthComputable && onProgress(e.loaded / e.total);
    xhr.onload = () => {
      try {
        resolve({ status: xhr.status, body: JSON.parse(xhr.responseText) as CsvReport });
      } catch {
        reject(new Error("The server's answer could not be read."));
      }
    };
    xhr.onerror = () => reject(new Error("The upload did not reach the server."));
    xhr.send(file);
  });
}

interface Props {
  /** The import endpoint; `commit` and `name` are added to its query string. */
  url: string;
  /** Extra controls beside the file input (e.g. what the file holds). */
  controls?: ReactNode;
  /** The line under the file input. */
  hint?: ReactNode;
  /** What to say once every row is in. */
  imported: (report: CsvReport) => ReactNode;
  /** Runs after a successful import (e.g. refresh the page's data). */
  onImported?: (report: CsvReport) => void;
  /** Names for the summary figures of a clean check. */
  summaryLabels?: Record<string, string>;
  /** Resets the report when the caller's choices change. */
  resetKey?: string;
  /** A CSV file with the header and one example row, offered for download. */
  template?: { href: string; label: string };
}

// Figures the imports report, in the words people use (a caller's `summaryLabels` come first).
const SUMMARY_WORDS: Record<string, string> = {
  volumeM3: "volume (m³)",
  cost: "cost",
  deliveries: "deliveries",
  blocks: "blocks",
};

/** `volumeM3` → "volume (m³)"; an unknown `someFigure` → "some figure", never the field name. */
export function summaryLabel(key: string, labels: Record<string, string> = {}): string {
  return (
    labels[key] ??
    SUMMARY_WORDS[key] ??
    key
      .replace(/M3$/, " (m³)")
      .replace(/([a-z])([A-Z])/g, "$1 $2")
      .toLowerCase()
  );
}

const fmt = (v: number) =>
  Number.isInteger(v)
    ? v.toLocaleString("en")
    : v.toLocaleString("en", { minimumFractionDigits: 2, maximumFractionDigits: 2 });

function summaryLine(summary: Record<string, number>, labels: Record<string, string>): string {
  return Object.entries(summary)
    .map(([k, v]) => `${summaryLabel(k, labels)}: ${fmt(v)}`)
    .join(" · ");
}

/**
 * Choose a CSV file, check it (nothing changes), then import every row or none — with a progress
 * bar for the upload and the server's work, and the problems listed by row and column.
 */
export function CsvUpload({
  url,
  controls,
  hint,
  imported,
  onImported,
  summaryLabels = {},
  resetKey,
  template,
}: Props) {
  const [file, setFile] = useState<File | null>(null);
  const [phase, setPhase] = useState<"idle" | "uploading" | "checking" | "saving">("idle");
  const [progress, setProgress] = useState(0);
  const [report, setReport] = useState<(CsvReport & { key?: string }) | null>(null);
  const [error, setError] = useState<string | null>(null);
  const announce = useAnnounce();
  useEffect(() => {
    if (phase === "uploading") announce("Sending the file…");
    else if (phase === "checking") announce("Checking every row…");
    else if (phase === "saving") announce("Saving every row in one go…");
  }, [phase, announce]);
  const shown = report && report.key === resetKey ? report : null;

  async function go(commit: boolean) {
    if (!file) return;
    setError(null);
    setPhase("uploading");
    setProgress(0);
    try {
      const res = await upload(url, file, commit, (f) => {
        setProgress(f);
        if (f >= 1) setPhase(commit ? "saving" : "checking");
      });
      if (res.body.error && !res.body.problems) setError(res.body.error);
      else {
        setReport({ ...res.body, key: resetKey });
        if (res.body.committed) onImported?.(res.body);
      }
    } catch (e) {
      setError(e instanceof Error ? e.message : "The import failed; nothing was saved.");
    } finally {
      setPhase("idle");
    }
  }

  const busy = phase !== "idle";
  return (
    <div className="space-y-5">
      <Card title="1 · Choose the file">
        <div className="flex flex-wrap items-end gap-4">
          {controls}
          <label className="text-sm">
            <span className="block font-medium text-ink-soft">CSV file (UTF-8)</span>
            <input
              type="file"
              accept=".csv,text/csv"
              onChange={(e) => {
                setFile(e.target.files?.[0] ?? null);
                setReport(null);
              }}
              className="mt-1 block min-h-11 text-sm"
            />
          </label>
          <Button onClick={() => go(false)} disabled={!file || busy}>
            Check the file
          </Button>
        </div>
        {template && (
          <p className="mt-3 text-sm">
            <a href={template.href} download className="font-medium">
              {template.label}
            </a>{" "}
            <span className="text-ink-faint">— the columns, with one example row to replace.</span>
          </p>
        )}
        {hint && <p className="mt-3 text-xs text-ink-faint">{hint}</p>}
      </Card>

      {busy && (
        <div className="space-y-1">
          <div
            className="h-3 overflow-hidden rounded-full bg-paper-sunk"
            role="progressbar"
            aria-label="Import progress"
            aria-valuemin={0}
            aria-valuemax={100}
            aria-valuenow={Math.round(progress * 100)}
          >
            <div
              className={`h-full bg-kerf transition-all ${phase !== "uploading" ? "animate-pulse" : ""}`}
              style={{ width: `${Math.max(4, progress * 100)}%` }}
            />
          </div>
          <p className="text-sm text-ink-soft">
            {phase === "uploading"
              ? `Sending… ${Math.round(progress * 100)} %`
              : phase === "checking"
                ? "Checking every row…"
                : "Saving every row in one go…"}
          </p>
        </div>
      )}
      {error && <ResultNotice tone="danger">{error}</ResultNotice>}

      {shown && (
        <Card title={shown.committed ? "3 · Imported" : "2 · What Blockyard found"}>
          {shown.committed ? (
            <ResultNotice tone="success">
              {Object.keys(shown.summary).length > 0 && (
                <span className="mb-2 block" data-testid="import-summary">
                  {summaryLine(shown.summary, summaryLabels)}
                </span>
              )}
              {imported(shown)}
            </ResultNotice>
          ) : shown.problemCount ? (
            <ResultNotice
              tone="danger"
              title={`${plural(shown.problemCount, "problem")} in ${plural(shown.rows, "row")} — nothing will be imported until they are fixed`}
            >
              Fix them in your spreadsheet and check the file again.
            </ResultNotice>
          ) : (
            <ResultNotice
              tone="success"
              title={shown.rows === 1 ? "The row is fine" : `All ${plural(shown.rows, "row")} are fine`}
            >
              <span data-testid="import-summary">{summaryLine(shown.summary, summaryLabels)}</span>
            </ResultNotice>
          )}
          {shown.problems.length > 0 && (
            <table className="mt-4" data-testid="import-problems">
              <thead>
                <tr>
                  <th className="py-1">Row</th>
                  <th>Column</th>
                  <th>Problem</th>
                </tr>
              </thead>
              <tbody>
                {shown.problems.map((p, i) => (
                  <tr key={i} className="border-t border-bead/60">
                    <td className="py-1 pr-3 tabular-nums">{p.row}</td>
                    <td className="pr-3">{p.column ?? "–"}</td>
                    <td>{p.message}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
          {shown.problemCount > shown.problems.length && (
            <p className="mt-2 text-sm text-ink-faint">…and {shown.problemCount - shown.problems.length} more.</p>
          )}
          {shown.warnings.length > 0 && (
            <div className="mt-4 space-y-1">
              {shown.warnings.map((w, i) => (
                <p key={i} className="text-sm text-wire">
                  Row {w.row}: {w.message}
                </p>
              ))}
            </div>
          )}
          {!shown.committed && !shown.problemCount && (
            <div className="mt-4">
              <Button onClick={() => go(true)} disabled={busy}>
                Import {plural(shown.rows, "row")}
              </Button>
            </div>
          )}
        </Card>
      )}
    </div>
  );
}
