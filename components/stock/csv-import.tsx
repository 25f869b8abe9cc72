"use client";

import Link from "next/link";
import { useState } from "react";
import { Button, buttonClass } from "@/components/ui/button";
import { Card, Notice } from "@/components/ui/card";

interface Problem { row: number; column?: string; message: string }
interface Report { committed: boolean; rows: number; problems: Problem[]; problemCount: number; warnings: Problem[]; summary: Record<string, number>; error?: string }

type Kind = "deliveries" | "stock-counts";

/** Sends the file with XHR so the bar can show upload progress, then the server's check. */
function upload(kind: Kind, file: File, commit: boolean, onProgress: (f: number) => void): Promise<{ status: number; body: Report }> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open("POST", `/api/imports/${kind}?commit=${commit ? 1 : 0}&name=${encodeURIComponent(file.name)}`);
    xhr.setRequestHeader("content-type", "text/csv");
    xhr.upload.onprogress = (e) => e.lengthComputable && onProgress(e.loaded / e.total);
    xhr.onload = () => {
      try {
        resolve({ status: xhr.status, body: JSON.parse(xhr.responseText) as Report });
      } catch {
        reject(new Error("The server's answer could not be read."));
      }
    };
    xhr.onerror = () => reject(new Error("The upload did not reach the server."));
    xhr.send(file);
  });
}

export function CsvImport() {
  const [kind, setKind] = useState<Kind>("deliveries");
  const [file, setFile] = useState<File | null>(null);
  const [phase, setPhase] = useState<"idle" | "uploading" | "checking" | "saving">("idle");
  const [progress, setProgress] = useState(0);
  const [report, setReport] = useState<Report | null>(null);
  const [error, setError] = useState<string | null>(null);

  async function go(commit: boolean) {
    if (!file) return;
    setError(null);
    setPhase("uploading");
    setProgress(0);
    try {
      const res = await upload(kind, file, commit, (f) => {
        setProgress(f);
        if (f >= 1) setPhase(commit ? "saving" : "checking");
      });
      if (res.body.error && !res.body.problems) setError(res.body.error);
      else setReport(res.body);
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
          <label className="text-sm">
            <span className="block font-medium text-ink-soft">What it holds</span>
            <select value={kind} onChange={(e) => { setKind(e.target.value as Kind); setReport(null); }} className="mt-1 min-h-11 rounded-md border border-bead-strong bg-paper-raised px-3">
              <option value="deliveries">Deliveries (one row per block received)</option>
              <option value="stock-counts">Stock count (one row per block counted)</option>
            </select>
          </label>
          <label className="text-sm">
            <span className="block font-medium text-ink-soft">CSV file (UTF-8)</span>
            <input type="file" accept=".csv,text/csv" onChange={(e) => { setFile(e.target.files?.[0] ?? null); setReport(null); }} className="mt-1 block min-h-11 text-sm" />
          </label>
          <Button onClick={() => go(false)} disabled={!file || busy}>Check the file</Button>
        </div>
        <p className="mt-3 text-xs text-ink-faint">
          Columns are listed in the README. Checking changes nothing; the import then takes every row or none.
        </p>
      </Card>

      {busy && (
        <div className="space-y-1" aria-live="polite">
          <div className="h-3 overflow-hidden rounded-full bg-paper-sunk" role="progressbar" aria-label="Import progress" aria-valuemin={0} aria-valuemax={100} aria-valuenow={Math.round(progress * 100)}>
            <div className={`h-full bg-kerf transition-all ${phase !== "uploading" ? "animate-pulse" : ""}`} style={{ width: `${Math.max(4, progress * 100)}%` }} />
          </div>
          <p className="text-sm text-ink-soft">
            {phase === "uploading" ? `Sending… ${Math.round(progress * 100)} %` : phase === "checking" ? "Checking every row…" : "Saving every row in one go…"}
          </p>
        </div>
      )}
      {error && <Notice tone="danger">{error}</Notice>}

      {report && (
        <Card title={report.committed ? "3 · Imported" : "2 · What Blockyard found"}>
          {report.committed ? (
            <Notice tone="success">
              {report.rows} rows imported and written to the stock ledger. <Link href="/stock">See the stock list</Link>.
            </Notice>
          ) : report.problemCount ? (
            <Notice tone="danger" title={`${report.problemCount} problem${report.problemCount === 1 ? "" : "s"} in ${report.rows} rows — nothing will be imported until they are fixed`}>
              Fix them in your spreadsheet and check the file again.
            </Notice>
          ) : (
            <Notice tone="success" title={`All ${report.rows} rows are fine`}>
              {Object.entries(report.summary).map(([k, v]) => `${k}: ${Number.isInteger(v) ? v : v.toFixed(2)}`).join(" · ")}
            </Notice>
          )}
          {report.problems.length > 0 && (
            <table className="mt-4" data-testid="import-problems">
              <thead><tr><th className="py-1">Row</th><th>Column</th><th>Problem</th></tr></thead>
              <tbody>
                {report.problems.map((p, i) => (
                  <tr key={i} className="border-t border-bead/60"><td className="py-1 pr-3 tabular-nums">{p.row}</td><td className="pr-3">{p.column ?? "–"}</td><td>{p.message}</td></tr>
                ))}
              </tbody>
            </table>
          )}
          {report.problemCount > report.problems.length && <p className="mt-2 text-sm text-ink-faint">…and {report.problemCount - report.problems.length} more.</p>}
          {report.warnings.length > 0 && (
            <div className="mt-4 space-y-1">
              {report.warnings.map((w, i) => <p key={i} className="text-sm text-wire">Row {w.row}: {w.message}</p>)}
            </div>
          )}
          {!report.committed && !report.problemCount && (
            <div className="mt-4"><Button onClick={() => go(true)} disabled={busy}>Import {report.rows} rows</Button></div>
          )}
          {report.committed && <div className="mt-4"><Link className={buttonClass("secondary")} href="/stock">Go to stock</Link></div>}
        </Card>
      )}
    </div>
  );
}
