"use client";

import Link from "next/link";
import { usePathname, useRouter, useSearchParams } from "next/navigation";
import { useEffect, useRef, useTransition } from "react";
import { useAnnounce } from "@/components/ui/announcer";
import { useBlocks, type BlockListResponse } from "@/lib/swr/use-blocks";
import { formatSize, lengthInUnit, m3ToBoardFeet, type LengthUnit } from "@/lib/units";
import { lengthMmOrNull } from "@/lib/forms";
import { SHOWN_STATUSES, STATUS_LABELS } from "@/lib/stock";
import { GradeChip, StatusBadge } from "./status-badge";
import { buttonClass, rowLinkClass } from "@/components/ui/button";
import { formatMoney } from "@/lib/format";

interface Props {
  initial: BlockListResponse;
  query: string;
  unit: LengthUnit;
  grades: { id: number; code: string }[];
  locations: string[];
  canExport: boolean;
}

const SORTS: [string, string][] = [
  ["received", "Oldest first (FIFO)"],
  ["code", "Code"],
  ["grade", "Grade"],
  ["volume", "Volume"],
  ["cut_not_before", "Cut-not-before"],
  ["location", "Location"],
  ["cost", "Value"],
];

export function StockTable({ initial, query, unit, grades, locations, canExport }: Props) {
  const router = useRouter();
  const path = usePathname();
  const params = useSearchParams();
  const [pending, start] = useTransition();
  const { data, isValidating } = useBlocks(query, initial);
  const list = data ?? initial;
  const pages = Math.max(1, Math.ceil(list.total / list.pageSize));
  // A new search or filter says its count in the page's live region; the first render says nothing.
  const announce = useAnnounce();
  const lastQuery = useRef(query);
  useEffect(() => {
    if (lastQuery.current === query || !data) return;
    lastQuery.current = query;
    announce(`${list.total.toLocaleString("en")} ${list.total === 1 ? "piece" : "pieces"} found.`);
  }, [query, data, list.total, announce]);

  function set(next: Record<string, string | null>) {
    const p = new URLSearchParams(params.toString());
    for (const [k, v] of Object.entries(next)) {
      if (v === null || v === "") p.delete(k);
      else p.set(k, v);
    }
    // A new filter or order starts again from the first page (cursors belong to one list).
    if (!("page" in next)) for (const k of ["page", "after", "before"]) p.delete(k);
    start(() => router.replace(`${path}?${p.toString()}`, { scroll: false }));
  }

  const v = (k: string) => params.get(k) ?? "";
  const lenLabel = unit === "in" ? "in" : "mm";
  const toMm = (s: string) => {
    const mm = lengthMmOrNull(s, unit);
    return mm === null ? null : String(mm);
  };
  const fromMm = (s: string) => (s === "" ? "" : String(lengthInUnit(Number(s), unit, 2)));

  return (
    <div className="space-y-4">
      {/* biome-ignore lint/a11y/useSemanticElements: a form that is also the search landmark */}
      <form
        className="grid gap-3 rounded-card border border-bead bg-paper-raised p-4 shadow-card sm:grid-cols-2 lg:grid-cols-4"
        onSubmit={(e) => {
          // Enter in any box, or the Search button: the typed filters together.
          e.preventDefault();
          const fd = new FormData(e.currentTarget);
          set({
            q: String(fd.get("q") ?? "").trim(),
            minLength: toMm(String(fd.get("minLength") ?? "")),
            maxLength: toMm(String(fd.get("maxLength") ?? "")),
          });
        }}
        role="search"
      >
        <div className="text-sm">
          <label htmlFor="stock-q" className="block font-medium text-ink-soft">
            Code or number
          </label>
          <div className="mt-1 flex gap-2">
            <input
              id="stock-q"
              name="q"
              type="search"
              defaultValue={v("q")}
              className="min-h-11 w-full min-w-0 rounded-md border border-bead-strong bg-paper-raised px-3"
              placeholder="HF-10 or 1047"
              maxLength={60}
              aria-describedby="stock-q-hint"
            />
            <button type="submit" className={buttonClass("primary", "px-3")}>
              Search
            </button>
          </div>
          <p id="stock-q-hint" className="mt-1 text-xs text-ink-faint">
            The start of a code, or the number on the label
          </p>
        </div>
        <label className="text-sm">
          <span className="block font-medium text-ink-soft">Status</span>
          <select
            value={v("status") || "available"}
            onChange={(e) => set({ status: e.target.value === "available" ? null : e.target.value })}
            className="mt-1 min-h-11 w-full rounded-md border border-bead-strong bg-paper-raised px-3"
          >
            <option value="available">In stock (all)</option>
            {SHOWN_STATUSES.map((s) => (
              <option key={s} value={s}>
                {STATUS_LABELS[s]}
              </option>
            ))}
            <option value="all">Everything, ever</option>
          </select>
        </label>
        <label className="text-sm">
          <span className="block font-medium text-ink-soft">Grade</span>
          <select
            value={v("grade")}
            onChange={(e) => set({ grade: e.target.value })}
            className="mt-1 min-h-11 w-full rounded-md border border-bead-strong bg-paper-raised px-3"
          >
            <option value="">Any grade</option>
            {grades.map((g) => (
              <option key={g.id} value={g.id}>
                {g.code}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm">
          <span className="block font-medium text-ink-soft">Location</span>
          <select
            value={v("location")}
            onChange={(e) => set({ location: e.target.value })}
            className="mt-1 min-h-11 w-full rounded-md border border-bead-strong bg-paper-raised px-3"
          >
            <option value="">Anywhere</option>
            {locations.map((l) => (
              <option key={l} value={l}>
                {l}
              </option>
            ))}
          </select>
        </label>
        <label className="text-sm">
          <span className="block font-medium text-ink-soft">Longest side at least ({lenLabel})</span>
          <input
            type="number"
            min={0}
            name="minLength"
            defaultValue={fromMm(v("minLength"))}
            onBlur={(e) => set({ minLength: toMm(e.target.value) })}
            className="mt-1 min-h-11 w-full rounded-md border border-bead-strong bg-paper-raised px-3"
          />
        </label>
        <label className="text-sm">
          <span className="block font-medium text-ink-soft">Longest side at most ({lenLabel})</span>
          <input
            type="number"
            min={0}
            name="maxLength"
            defaultValue={fromMm(v("maxLength"))}
            onBlur={(e) => set({ maxLength: toMm(e.target.value) })}
            className="mt-1 min-h-11 w-full rounded-md border border-bead-strong bg-paper-raised px-3"
          />
        </label>
        <label className="text-sm">
          <span className="block font-medium text-ink-soft">Blocks or offcuts</span>
          <select
            value={v("offcuts")}
            onChange={(e) => set({ offcuts: e.target.value })}
            className="mt-1 min-h-11 w-full rounded-md border border-bead-strong bg-paper-raised px-3"
          >
            <option value="">Both</option>
            <option value="exclude">Whole blocks only</option>
            <option value="only">Offcuts only</option>
          </select>
        </label>
        <label className="text-sm">
          <span className="block font-medium text-ink-soft">Sort</span>
          <div className="mt-1 flex gap-2">
            <select
              value={v("sort") || "received"}
              onChange={(e) => set({ sort: e.target.value })}
              className="min-h-11 w-full rounded-md border border-bead-strong bg-paper-raised px-3"
            >
              {SORTS.map(([k, label]) => (
                <option key={k} value={k}>
                  {label}
                </option>
              ))}
            </select>
            <button
              type="button"
              className={buttonClass("secondary", "px-3")}
              onClick={() => set({ dir: v("dir") === "desc" ? "asc" : "desc" })}
              aria-label="Reverse the order"
            >
              {v("dir") === "desc" ? "↓" : "↑"}
            </button>
          </div>
        </label>
      </form>

      <div className="flex flex-wrap items-center justify-between gap-3">
        <p className="text-sm" data-testid="stock-totals">
          <strong>{list.total.toLocaleString("en")}</strong> {list.total === 1 ? "piece" : "pieces"} ·{" "}
          <strong>{list.totals.volumeM3.toLocaleString("en", { maximumFractionDigits: 2 })} m³</strong> ·{" "}
          <strong>{Math.round(m3ToBoardFeet(list.totals.volumeM3)).toLocaleString("en")} BF</strong>
          {list.totals.value !== null && (
            <>
              {" "}
              · value <strong>{formatMoney(list.totals.value)}</strong>
            </>
          )}
          {(pending || isValidating) && <span className="ml-2 text-ink-faint">updating…</span>}
        </p>
        {canExport && (
          <a className={buttonClass("secondary")} href={`/api/blocks/export?${query}`} download>
            Export these as CSV
          </a>
        )}
      </div>

      {/* Narrow screens (a tablet at the machine): one card per piece, every field a cutter needs in
          view, the whole card opens the piece. Wide screens: the table. */}
      <ul className="space-y-2 lg:hidden" aria-label="Pieces">
        {list.items.map((b) => (
          <li
            key={b.id}
            className="relative rounded-card border border-bead bg-paper-raised px-4 py-3 shadow-card hover:bg-paper"
          >
            <div className="flex flex-wrap items-center justify-between gap-x-3 gap-y-1">
              <Link
                className="inline-flex min-h-11 min-w-11 items-center whitespace-nowrap text-lg font-semibold after:absolute after:inset-0 after:content-['']"
                href={`/stock/${encodeURIComponent(b.code)}`}
                prefetch={false}
              >
                {b.code}
              </Link>
              <span className="flex items-center gap-2">
                {b.isOffcut && <span className="text-sm text-ink-soft">offcut</span>}
                <StatusBadge status={b.shown} hold={b.hold?.reason} />
              </span>
            </div>
            <dl className="mt-1 grid grid-cols-2 gap-x-4 gap-y-1 text-[15px]">
              <div>
                <dt className="text-sm text-ink-soft">Grade</dt>
                <dd>
                  <GradeChip code={b.gradeCode} colour={b.colour} noWire={b.neverHotWire} />
                </dd>
              </div>
              <div>
                <dt className="text-sm text-ink-soft">Size · m³</dt>
                <dd className="whitespace-nowrap tabular-nums">
                  {formatSize(b.size, unit)} · {b.volumeM3.toFixed(3)}
                </dd>
              </div>
              <div>
                <dt className="text-sm text-ink-soft">Location · lot</dt>
                <dd>
                  {b.location || "–"} · {b.lot || "–"}
                </dd>
              </div>
              <div>
                <dt className="text-sm text-ink-soft">Defects · FIFO</dt>
                <dd>
                  {b.defectCount ? (
                    <span className="font-semibold text-ember">
                      {b.defectCount} {b.defectCount === 1 ? "zone" : "zones"}
                    </span>
                  ) : (
                    "none"
                  )}{" "}
                  · {b.fifo ?? "–"}
                  {b.shown === "settling" && <> · until {b.cutNotBefore}</>}
                </dd>
              </div>
            </dl>
          </li>
        ))}
        {!list.items.length && (
          <li className="rounded-card border border-bead bg-paper-raised px-4 py-10 text-center text-ink-soft">
            No stock matches these filters.
          </li>
        )}
      </ul>

      <div className="hidden overflow-x-auto rounded-card border border-bead bg-paper-raised shadow-card lg:block">
        <table>
          <thead className="border-b border-bead bg-paper-sunk">
            <tr>
              <th className="px-3 py-2">Code</th>
              <th className="px-3 py-2">Grade</th>
              <th className="px-3 py-2">Size</th>
              <th className="px-3 py-2 text-right">m³</th>
              <th className="px-3 py-2">Status</th>
              <th className="px-3 py-2" title="First in, first out: the order ready blocks of a grade should be used">
                FIFO
              </th>
              <th className="px-3 py-2">Location</th>
              <th className="px-3 py-2">Lot</th>
              <th className="px-3 py-2 text-right">Defects</th>
            </tr>
          </thead>
          <tbody>
            {list.items.map((b) => (
              <tr key={b.id} className="border-b border-bead/60 last:border-0 hover:bg-paper">
                <td className="px-3 py-0">
                  <div className="flex items-center gap-2 whitespace-nowrap">
                    <Link className={rowLinkClass} href={`/stock/${encodeURIComponent(b.code)}`} prefetch={false}>
                      {b.code}
                    </Link>
                    {b.isOffcut && <span className="text-xs text-ink-faint">offcut</span>}
                  </div>
                </td>
                <td className="px-3 py-2">
                  <GradeChip code={b.gradeCode} colour={b.colour} noWire={b.neverHotWire} />
                </td>
                <td className="whitespace-nowrap px-3 py-2">{formatSize(b.size, unit)}</td>
                <td className="px-3 py-2 text-right tabular-nums">{b.volumeM3.toFixed(3)}</td>
                <td className="whitespace-nowrap px-3 py-2">
                  <StatusBadge status={b.shown} hold={b.hold?.reason} />
                  {b.shown === "settling" && (
                    <span className="ml-1 text-xs text-ink-faint">until {b.cutNotBefore}</span>
                  )}
                </td>
                <td className="px-3 py-2 tabular-nums">{b.fifo ?? "–"}</td>
                <td className="whitespace-nowrap px-3 py-2">{b.location}</td>
                <td className="whitespace-nowrap px-3 py-2">{b.lot}</td>
                <td className="px-3 py-2 text-right">
                  {b.defectCount ? <span className="font-medium text-ember">{b.defectCount}</span> : "–"}
                </td>
              </tr>
            ))}
            {!list.items.length && (
              <tr>
                <td colSpan={9} className="px-3 py-10 text-center text-ink-soft">
                  No stock matches these filters.
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </div>

      <nav className="flex items-center justify-between gap-3" aria-label="Pages">
        <button
          type="button"
          className={buttonClass("secondary")}
          disabled={!list.prev}
          onClick={() => set({ page: String(Math.max(1, list.page - 1)), before: list.prev, after: null })}
        >
          Previous
        </button>
        <span className="text-sm text-ink-soft">
          Page {list.page} of {pages}
        </span>
        <button
          type="button"
          className={buttonClass("secondary")}
          disabled={!list.next}
          onClick={() => set({ page: String(list.page + 1), after: list.next, before: null })}
        >
          Next
        </button>
      </nav>
    </div>
  );
}
