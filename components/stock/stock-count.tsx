"use client";

import Link from "next/link";
import { useEffect, useState, type FormEvent } from "react";
import type { CountedLine, ScanCountReport } from "@/db/queries/stock-counts";
import { ApiError, fetcher, send } from "@/lib/swr/fetcher";
import { codeFromScan } from "@/lib/block-code";
import { plural } from "@/lib/format";
import { formatSize, lengthInUnit, lengthToMm, type LengthUnit } from "@/lib/units";
import { Button } from "@/components/ui/button";
import { Badge, Card } from "@/components/ui/card";
import { Field, Input, Select } from "@/components/ui/field";
import { ResultNotice } from "@/components/ui/result-notice";
import { QrScanner } from "./qr-scanner";
import type { Vec3 } from "@/lib/nesting";

// What this page reads from the API, as the server's query module types it (type-only imports are
// erased from the client bundle): a scanned block is checked into a CountedLine.
type CheckedBlock = CountedLine;
type CountReport = ScanCountReport;

/** One block counted on this tablet, kept until the count is reconciled. */
interface Counted {
  code: string;
  gradeCode: string;
  size: Vec3;
  recordedLocation: string;
  /** Where it was found. */
  location: string;
  /** The measured size when it was not the register's (mm). */
  measured: Vec3 | null;
}

interface Saved {
  /** null: the whole yard. */
  location: string | null;
  items: Counted[];
  startedAt: string;
}

// The count in progress lives in this browser until it is reconciled: a tablet that sleeps or a
// page reloaded by accident loses nothing.
const STORE = "blockyard.stock-count.v1";
const load = (): Saved | null => {
  try {
    const v = JSON.parse(localStorage.getItem(STORE) ?? "null") as Saved | null;
    return v && Array.isArray(v.items) ? v : null;
  } catch {
    return null;
  }
};
const save = (v: Saved | null) => {
  try {
    if (v) localStorage.setItem(STORE, JSON.stringify(v));
    else localStorage.removeItem(STORE);
  } catch {
    /* private mode: the count lives as long as the page */
  }
};

type Notice = { tone: "success" | "danger" | "info" | "caution"; text: string };
const WHOLE_YARD = "";
const AXES = ["Length", "Width", "Height"] as const;

const place = (location: string | null) => (location ? location : "the whole yard");

/**
 * A stock count by scanning on the tablet: choose the place, then for each block scan its label
 * (or type the code), check the size and place the register has, confirm or correct, next. At the
 * end the count is checked against the register (what is moved, re-measured, not found) and, once
 * confirmed, reconciled in the ledger by the server (POST /api/stock-counts).
 */
export function StockCount({ locations, unit }: { locations: string[]; unit: LengthUnit }) {
  const [count, setCount] = useState<Saved | null>(null);
  const [restored, setRestored] = useState(false);
  const [startAt, setStartAt] = useState(WHOLE_YARD);
  const [checking, setChecking] = useState<CheckedBlock | null>(null);
  const [typed, setTyped] = useState("");
  const [busy, setBusy] = useState(false);
  const [notice, setNotice] = useState<Notice | null>(null);
  const [fields, setFields] = useState<Record<string, string>>({});
  const [review, setReview] = useState<CountReport | null>(null);
  const [done, setDone] = useState<CountReport | null>(null);

  useEffect(() => {
    const saved = load();
    if (saved) setCount(saved);
    setRestored(true);
  }, []);
  useEffect(() => {
    if (restored) save(count);
  }, [count, restored]);

  const start = () => {
    setCount({ location: startAt || null, items: [], startedAt: new Date().toISOString() });
    setDone(null);
    setReview(null);
    setNotice({
      tone: "info",
      text: `Counting ${place(startAt || null)}. Scan the first label, or type its code.`,
    });
  };

  const lookUp = async (raw: string) => {
    if (!count) return;
    const code = codeFromScan(raw) ?? raw.trim().toUpperCase();
    setFields({});
    if (!code) {
      setFields({ code: "Type the block code printed on the label, e.g. HF-1001." });
      return setNotice({ tone: "danger", text: "Type the block code printed on the label, e.g. HF-1001." });
    }
    const already = count.items.findIndex((c) => c.code.toUpperCase() === code.toUpperCase());
    if (already >= 0) {
      return setNotice({
        tone: "caution",
        text: `${count.items[already]!.code} is already counted (number ${already + 1} in the list). Scan the next label.`,
      });
    }
    setBusy(true);
    try {
      const { block } = await fetcher<{ block: CheckedBlock }>(
        `/api/stock-counts/check?code=${encodeURIComponent(code)}`,
      );
      setChecking(block);
      setTyped("");
      setNotice({
        tone: "info",
        text: `Found ${block.code}: check its size and place, then confirm.`,
      });
    } catch (e) {
      setChecking(null);
      const text =
        e instanceof ApiError ? e.message : "The block could not be looked up. Check the connection and try again.";
      setFields({ code: text });
      setNotice({ tone: "danger", text });
    } finally {
      setBusy(false);
    }
  };

  const confirm = (c: Counted) => {
    if (!count) return;
    const items = [...count.items, c];
    setCount({ ...count, items });
    setChecking(null);
    const where = c.location !== c.recordedLocation ? ` at ${c.location} (moved from ${c.recordedLocation})` : "";
    setNotice({
      tone: "success",
      text: `${c.code} counted${where}. ${plural(items.length, "block")} so far: scan the next label.`,
    });
  };

  const remove = (code: string) => {
    if (!count) return;
    setCount({ ...count, items: count.items.filter((c) => c.code !== code) });
    setNotice({ tone: "info", text: `${code} taken off the count.` });
  };

  const body = (c: Saved) => ({
    location: c.location,
    counted: c.items.map((i) => ({ code: i.code, location: i.location, size: i.measured })),
  });

  const check = async () => {
    if (!count) return;
    setBusy(true);
    try {
      const report = await send<CountReport>("/api/stock-counts?commit=0", "POST", body(count));
      setReview(report);
      setNotice({
        tone: report.summary.writtenOff ? "caution" : "info",
        text: `Checked: ${plural(report.summary.counted, "block")} counted, ${report.summary.moved} moved, ${report.summary.missing} not found. Nothing is changed until you reconcile.`,
      });
    } catch (e) {
      setNotice({
        tone: "danger",
        text: e instanceof ApiError ? e.message : "The count could not be checked; try again.",
      });
    } finally {
      setBusy(false);
    }
  };

  const commit = async () => {
    if (!count || !review) return;
    setBusy(true);
    try {
      const report = await send<CountReport>("/api/stock-counts?commit=1", "POST", {
        ...body(count),
        missing: review.missing.map((m) => m.code),
      });
      setDone(report);
      setReview(null);
      setCount(null);
      const s = report.summary;
      setNotice({
        tone: "success",
        text: `Count of ${place(report.location)} reconciled: ${plural(s.counted, "block")} confirmed, ${s.moved} moved, ${s.remeasured} re-measured, ${s.writtenOff} written off.`,
      });
    } catch (e) {
      // The stock changed since the check (409): check again, so the list is what is written off.
      if (e instanceof ApiError && e.status === 409) setReview(null);
      setNotice({ tone: "danger", text: e instanceof ApiError ? e.message : "The count was not saved; try again." });
    } finally {
      setBusy(false);
    }
  };

  const discard = () => {
    setCount(null);
    setChecking(null);
    setReview(null);
    setNotice({ tone: "info", text: "The count was discarded; nothing was changed." });
  };

  if (!restored) return null;

  const shownNotice = notice && <ResultNotice tone={notice.tone}>{notice.text}</ResultNotice>;

  if (!count) {
    return (
      <div className="space-y-5">
        {shownNotice}
        {done && <CountDone report={done} unit={unit} />}
        <Card title="Start a count">
          <div className="max-w-md space-y-4">
            <Field
              label="Place to count"
              name="count-location"
              hint="Blocks recorded at this place that you do not scan are listed as not found at the end."
            >
              <Select name="count-location" value={startAt} onChange={(e) => setStartAt(e.target.value)}>
                <option value={WHOLE_YARD}>The whole yard</option>
                {locations.map((l) => (
                  <option key={l} value={l}>
                    {l}
                  </option>
                ))}
              </Select>
            </Field>
            <Button onClick={start}>Start counting</Button>
          </div>
        </Card>
      </div>
    );
  }

  if (review) {
    return (
      <div className="space-y-5">
        {shownNotice}
        <CountReview report={review} unit={unit} />
        <div className="flex flex-wrap gap-3">
          <Button tone={review.summary.writtenOff ? "danger" : "primary"} disabled={busy} onClick={() => void commit()}>
            {busy
              ? "Reconciling…"
              : review.summary.writtenOff
                ? `Reconcile and write off ${plural(review.summary.writtenOff, "block")}`
                : "Reconcile the count"}
          </Button>
          <Button tone="secondary" disabled={busy} onClick={() => setReview(null)}>
            Back to counting
          </Button>
        </div>
      </div>
    );
  }

  return (
    <div className="space-y-5">
      <section
        aria-label="Count in progress"
        className="flex flex-wrap items-center justify-between gap-3 rounded-card border border-bead bg-paper-raised px-5 py-3 shadow-card"
      >
        <p className="text-base">
          Counting <strong>{place(count.location)}</strong> · {plural(count.items.length, "block")} counted
        </p>
        <div className="flex flex-wrap gap-2">
          <Button disabled={busy || (!count.location && count.items.length === 0)} onClick={() => void check()}>
            Finish the count
          </Button>
          <Button tone="quiet" disabled={busy} onClick={discard}>
            Discard the count
          </Button>
        </div>
      </section>
      {shownNotice}
      {checking ? (
        <ConfirmBlock
          key={checking.code}
          block={checking}
          countLocation={count.location}
          locations={locations}
          unit={unit}
          onConfirm={confirm}
          onSkip={() => (
            setChecking(null), setNotice({ tone: "info", text: `${checking.code} not counted. Scan the next label.` })
          )}
        />
      ) : (
        <Card title="Scan the next label">
          <QrScanner onCode={(c) => void lookUp(c)} />
          <form
            className="mt-4 flex flex-wrap items-end gap-3 border-t border-bead pt-4"
            onSubmit={(e: FormEvent) => (e.preventDefault(), void lookUp(typed))}
          >
            <div className="min-w-48 flex-1">
              <Field label="Or type the code" name="code" error={fields.code}>
                <Input
                  name="code"
                  value={typed}
                  autoComplete="off"
                  autoCapitalize="characters"
                  spellCheck={false}
                  error={fields.code}
                  onChange={(e) => setTyped(e.target.value)}
                />
              </Field>
            </div>
            <Button type="submit" tone="secondary" disabled={busy}>
              {busy ? "Looking…" : "Find block"}
            </Button>
          </form>
        </Card>
      )}
      <CountedList items={count.items} unit={unit} onRemove={remove} />
    </div>
  );
}

/** The scanned block as the register has it: size and place confirmed or corrected. */
function ConfirmBlock({
  block,
  countLocation,
  locations,
  unit,
  onConfirm,
  onSkip,
}: {
  block: CheckedBlock;
  countLocation: string | null;
  locations: string[];
  unit: LengthUnit;
  onConfirm: (c: Counted) => void;
  onSkip: () => void;
}) {
  const [sizeRight, setSizeRight] = useState(true);
  const [measured, setMeasured] = useState<[string, string, string]>(
    () => block.size.map((v) => String(lengthInUnit(v, unit))) as [string, string, string],
  );
  const [location, setLocation] = useState(countLocation ?? block.recordedLocation);
  const [fields, setFields] = useState<Record<string, string>>({});

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const errors: Record<string, string> = {};
    const where = location.trim();
    if (!where) errors.location = "Say where the block is.";
    else if (where.length > 60) errors.location = "At most 60 characters.";
    let size: Vec3 | null = null;
    if (!sizeRight) {
      const mm = measured.map((s, i) => {
        const n = Number(s.trim().replace(/\s/g, ""));
        if (!s.trim() || !Number.isFinite(n) || n <= 0) {
          errors[`size.${i}`] = `${AXES[i]}: enter the measured ${AXES[i]!.toLowerCase()} in ${unit}, more than 0.`;
          return 0;
        }
        const v = lengthToMm(n, unit);
        if (v > 30_000) errors[`size.${i}`] = `${AXES[i]}: at most 30 000 mm.`;
        return v;
      });
      size = mm as Vec3;
    }
    setFields(errors);
    if (Object.keys(errors).length) return;
    const same = size?.every((v, i) => Math.abs(v - block.size[i]!) < 1e-6);
    onConfirm({
      code: block.code,
      gradeCode: block.gradeCode,
      size: block.size,
      recordedLocation: block.recordedLocation,
      location: where,
      measured: same ? null : size,
    });
  };

  const elsewhere = countLocation && countLocation !== block.recordedLocation;
  return (
    <Card title={`Check ${block.code}`}>
      <form onSubmit={submit} className="space-y-4" noValidate>
        <dl className="grid grid-cols-[auto_1fr] gap-x-6 gap-y-1 text-base" data-testid="count-check">
          <dt className="text-ink-soft">Grade</dt>
          <dd>{block.gradeCode}</dd>
          <dt className="text-ink-soft">Size</dt>
          <dd>{formatSize(block.size, unit)}</dd>
          <dt className="text-ink-soft">Recorded at</dt>
          <dd>{block.recordedLocation}</dd>
          {block.status !== "in_stock" && (
            <>
              <dt className="text-ink-soft">Status</dt>
              <dd>
                {block.status === "earmarked"
                  ? "Earmarked for a plan"
                  : block.status === "on_hold"
                    ? "On hold"
                    : block.status}
              </dd>
            </>
          )}
        </dl>
        {elsewhere && (
          <p className="text-sm">
            The register has it at {block.recordedLocation}; confirming moves it to where you found it.
          </p>
        )}
        <fieldset className="space-y-2">
          <legend className="text-sm font-medium text-ink-soft">Is the size right?</legend>
          <div className="flex flex-wrap gap-2">
            {(
              [
                { value: true, label: "Yes, as recorded" },
                { value: false, label: "No, I measured it" },
              ] as const
            ).map((o) => (
              <label
                key={o.label}
                className="inline-flex min-h-11 cursor-pointer items-center gap-2 rounded-md border border-bead-strong px-3 text-sm"
              >
                <input
                  type="radio"
                  name="size-right"
                  className="size-5"
                  checked={sizeRight === o.value}
                  onChange={() => setSizeRight(o.value)}
                />
                {o.label}
              </label>
            ))}
          </div>
          {!sizeRight && (
            <div className="grid gap-3 sm:grid-cols-3">
              {AXES.map((axis, i) => (
                <Field
                  key={axis}
                  label={`Measured ${axis.toLowerCase()} (${unit})`}
                  name={`size-${i}`}
                  error={fields[`size.${i}`]}
                >
                  <Input
                    name={`size-${i}`}
                    inputMode="decimal"
                    value={measured[i]}
                    error={fields[`size.${i}`]}
                    onChange={(e) =>
                      setMeasured((m) => {
                        const next = [...m] as [string, string, string];
                        next[i] = e.target.value;
                        return next;
                      })
                    }
                  />
                </Field>
              ))}
            </div>
          )}
        </fieldset>
        <Field label="Where it is" name="found-at" error={fields.location}>
          <Input
            name="found-at"
            list="count-locations"
            value={location}
            error={fields.location}
            onChange={(e) => setLocation(e.target.value)}
          />
          <datalist id="count-locations">
            {locations.map((l) => (
              <option key={l} value={l} />
            ))}
          </datalist>
        </Field>
        <div className="flex flex-wrap gap-3">
          <Button type="submit">Confirm and scan the next</Button>
          <Button tone="quiet" onClick={onSkip}>
            Not this block
          </Button>
        </div>
      </form>
    </Card>
  );
}

function CountedList({
  items,
  unit,
  onRemove,
}: {
  items: Counted[];
  unit: LengthUnit;
  onRemove: (code: string) => void;
}) {
  if (!items.length) return null;
  return (
    <Card title={`Counted (${items.length})`}>
      <ol className="divide-y divide-bead" data-testid="counted-list">
        {[...items].reverse().map((c) => (
          <li key={c.code} className="flex flex-wrap items-center justify-between gap-3 py-2">
            <div className="min-w-0">
              <p className="font-medium whitespace-nowrap">{c.code}</p>
              <p className="text-sm text-ink-soft">
                {c.gradeCode} · {formatSize(c.measured ?? c.size, unit)} · {c.location}
              </p>
              <p className="flex flex-wrap gap-2">
                {c.location !== c.recordedLocation && <Badge tone="wire">moved from {c.recordedLocation}</Badge>}
                {c.measured && <Badge tone="wire">re-measured (was {formatSize(c.size, unit)})</Badge>}
              </p>
            </div>
            <Button tone="quiet" aria-label={`Take ${c.code} off the count`} onClick={() => onRemove(c.code)}>
              Remove
            </Button>
          </li>
        ))}
      </ol>
    </Card>
  );
}

function BlockLines({ lines }: { lines: { code: string; text: string }[] }) {
  return (
    <ul className="divide-y divide-bead">
      {lines.map((l) => (
        <li key={l.code} className="py-2 text-base">
          <span className="font-medium whitespace-nowrap">{l.code}</span>{" "}
          <span className="text-ink-soft">{l.text}</span>
        </li>
      ))}
    </ul>
  );
}

/** What reconciling would do, for the person to confirm. */
function CountReview({ report, unit }: { report: CountReport; unit: LengthUnit }) {
  const moved = report.counted.filter((c) => c.moved);
  const remeasured = report.counted.filter((c) => c.remeasured);
  const writeOff = report.missing.filter((m) => !m.earmarked);
  const earmarked = report.missing.filter((m) => m.earmarked);
  return (
    <Card title={`Check the count of ${place(report.location)}`}>
      <div className="space-y-4" data-testid="count-review">
        <p className="text-base">
          {plural(report.summary.counted, "block")} counted, {report.summary.moved} to move, {report.summary.remeasured}{" "}
          re-measured, {report.summary.missing} not found.
        </p>
        {moved.length > 0 && (
          <section>
            <h3 className="font-semibold">To move ({moved.length})</h3>
            <BlockLines
              lines={moved.map((c) => ({ code: c.code, text: `from ${c.recordedLocation} to ${c.location}` }))}
            />
          </section>
        )}
        {remeasured.length > 0 && (
          <section>
            <h3 className="font-semibold">Re-measured ({remeasured.length})</h3>
            <BlockLines
              lines={remeasured.map((c) => ({
                code: c.code,
                text: `${formatSize(c.size, unit)} → ${formatSize(c.remeasured!, unit)}`,
              }))}
            />
          </section>
        )}
        {writeOff.length > 0 && (
          <section>
            <h3 className="font-semibold">Not found: written off when you reconcile ({writeOff.length})</h3>
            <BlockLines
              lines={writeOff.map((m) => ({
                code: m.code,
                text: `${m.gradeCode} · ${formatSize(m.size, unit)} · recorded at ${m.location}`,
              }))}
            />
          </section>
        )}
        {earmarked.length > 0 && (
          <section>
            <h3 className="font-semibold">Not found but earmarked for a plan: kept ({earmarked.length})</h3>
            <p className="text-sm text-ink-soft">Ask the planner to release them; write them off afterwards.</p>
            <BlockLines
              lines={earmarked.map((m) => ({
                code: m.code,
                text: `${m.gradeCode} · ${formatSize(m.size, unit)} · recorded at ${m.location}`,
              }))}
            />
          </section>
        )}
        {!moved.length && !remeasured.length && !report.missing.length && (
          <p className="text-base">Everything is where the register has it: reconciling only records the count.</p>
        )}
      </div>
    </Card>
  );
}

function CountDone({ report, unit }: { report: CountReport; unit: LengthUnit }) {
  const written = report.missing.filter((m) => !m.earmarked);
  return (
    <Card title={`Count of ${place(report.location)} reconciled`}>
      <div className="space-y-3" data-testid="count-done">
        <BlockLines
          lines={report.counted.map((c) => ({
            code: c.code,
            text: `confirmed at ${c.location}${c.moved ? ` (moved from ${c.recordedLocation})` : ""}${c.remeasured ? `, re-measured ${formatSize(c.remeasured, unit)}` : ""}`,
          }))}
        />
        {written.length > 0 && (
          <BlockLines lines={written.map((m) => ({ code: m.code, text: `written off: not found at ${m.location}` }))} />
        )}
        <p className="text-sm">
          The write-offs and re-measures are in the <Link href="/ledger">stock ledger</Link> under {report.ref}.
        </p>
      </div>
    </Card>
  );
}
