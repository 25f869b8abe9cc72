"use client";

import Link from "next/link";
import { useState, type ReactNode } from "react";
import { send } from "@/lib/swr/fetcher";
import { useSubmit } from "@/components/ui/use-submit";
import { Button, buttonClass } from "@/components/ui/button";
import { Card, Notice } from "@/components/ui/card";
import { ResultNotice } from "@/components/ui/result-notice";
import { errorId, Field, Input, Select, tiedError } from "@/components/ui/field";
import { addDays, isoDate } from "@/lib/stock";
import type { LengthUnit } from "@/lib/units";
import { lengthMmOrNull } from "@/lib/forms";
import { receivedCodeProblem } from "@/lib/block-code";
import { formatVolume } from "@/lib/units";
import type { Grade } from "@/db/queries/grades";

/** What the form needs of a grade (the server's Grade; a type-only import, erased from the client bundle). */
type GradeOption = Pick<Grade, "id" | "code" | "minDensity" | "cureDays" | "neverHotWire">;
export interface Row {
  /** The row's own identity for React and for edits: never shared, never reused. */
  key: number;
  code: string;
  gradeId: string;
  x: string;
  y: string;
  z: string;
  weight: string;
  cost: string;
  location: string;
  mouldedOn: string;
}

export const blankRow = (key: number): Row => ({
  key,
  code: "",
  gradeId: "",
  x: "",
  y: "",
  z: "",
  weight: "",
  cost: "",
  location: "Curing room",
  mouldedOn: "",
});

/** A copy of row `key` right after it, under the new `key` `fresh` and without its code (codes are unique). */
export function copyRow(rows: readonly Row[], key: number, fresh: number): Row[] {
  const i = rows.findIndex((r) => r.key === key);
  if (i < 0) return [...rows];
  return [...rows.slice(0, i + 1), { ...rows[i]!, key: fresh, code: "" }, ...rows.slice(i + 1)];
}

/** Row `key` changed by `patch`; the other rows untouched. */
export function updateRow(rows: readonly Row[], key: number, patch: Partial<Omit<Row, "key">>): Row[] {
  return rows.map((r) => (r.key === key ? { ...r, ...patch } : r));
}

/** Every row but row `key`; the last row stays (a delivery has at least one block). */
export function removeRow(rows: readonly Row[], key: number): Row[] {
  return rows.length > 1 ? rows.filter((r) => r.key !== key) : [...rows];
}

let lastKey = 0;
const freshKey = () => ++lastKey;

/** One delivery, many blocks: tab through measured sizes, copy a row for the next block of the same kind. */
export function ReceiveForm({
  suppliers,
  grades,
  unit,
}: {
  suppliers: { id: number; name: string }[];
  grades: GradeOption[];
  unit: LengthUnit;
}) {
  const [rows, setRows] = useState<Row[]>(() => [blankRow(freshKey())]);
  const { busy, fields, message, submit } = useSubmit();
  const [done, setDone] = useState<{ codes: string[]; warnings: { index: number; message: string }[] } | null>(null);
  const [receivedOn, setReceivedOn] = useState(isoDate());
  const toMm = (s: string) => lengthMmOrNull(s, unit);
  const update = (key: number, patch: Partial<Omit<Row, "key">>) => setRows((rs) => updateRow(rs, key, patch));
  const cell = "min-h-11 w-full rounded-md border bg-paper-raised px-2 text-sm";
  const bad = (k: string) => (fields[k] ? "border-ember" : "border-bead-strong");

  if (done) {
    return (
      <Card title="Delivery received">
        <div className="mb-3">
          <ResultNotice tone="success">
            {`${done.codes.length} ${done.codes.length === 1 ? "block is" : "blocks are"} in stock: ${done.codes.join(", ")}.`}
          </ResultNotice>
        </div>
        {done.warnings.map((w) => (
          <div key={w.index} className="mb-2">
            <Notice tone="caution">
              Row {w.index + 1}: {w.message}
            </Notice>
          </div>
        ))}
        <div className="flex flex-wrap gap-3">
          <Link className={buttonClass("primary")} href={`/labels?codes=${encodeURIComponent(done.codes.join(","))}`}>
            Print their labels
          </Link>
          <Link className={buttonClass("secondary")} href="/stock">
            See the stock list
          </Link>
          <Button
            tone="quiet"
            onClick={() => {
              setDone(null);
              setRows([blankRow(freshKey())]);
            }}
          >
            Receive another
          </Button>
        </div>
      </Card>
    );
  }

  return (
    <form
      className="space-y-5"
      onSubmit={async (e) => {
        e.preventDefault();
        const fd = new FormData(e.currentTarget);
        const res = await submit(
          () =>
            send<{ codes: string[]; warnings: { index: number; message: string }[] }>("/api/deliveries", "POST", {
              supplierId: Number(fd.get("supplierId")) || null,
              receivedOn: fd.get("receivedOn"),
              poRef: fd.get("poRef"),
              lot: fd.get("lot"),
              notes: fd.get("notes"),
              blocks: rows.map((r) => ({
                code: r.code || null,
                gradeId: Number(r.gradeId) || null,
                size: [toMm(r.x), toMm(r.y), toMm(r.z)],
                weightKg: r.weight ? Number(r.weight) : null,
                cost: r.cost === "" ? null : Number(r.cost),
                location: r.location,
                mouldedOn: r.mouldedOn || null,
              })),
            }),
          { failed: "The delivery was not saved." },
        );
        if (res) setDone(res);
      }}
    >
      {message && (
        <ResultNotice tone={message.tone}>
          {message.tone === "danger" ? `${message.text} Nothing was saved.` : message.text}
        </ResultNotice>
      )}
      <Card title="The delivery">
        <div className="grid gap-4 md:grid-cols-2 lg:grid-cols-4">
          <Field label="Supplier" name="supplierId" error={fields.supplierId}>
            <Select name="supplierId" defaultValue="" error={fields.supplierId}>
              <option value="" disabled>
                Choose…
              </option>
              {suppliers.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.name}
                </option>
              ))}
            </Select>
          </Field>
          <Field label="Received on" name="receivedOn" error={fields.receivedOn}>
            <Input
              name="receivedOn"
              type="date"
              value={receivedOn}
              onChange={(e) => setReceivedOn(e.target.value)}
              error={fields.receivedOn}
            />
          </Field>
          <Field label="Lot" name="lot" error={fields.lot}>
            <Input name="lot" error={fields.lot} />
          </Field>
          <Field label="PO reference" name="poRef" error={fields.poRef}>
            <Input name="poRef" error={fields.poRef} />
          </Field>
          <div className="md:col-span-2 lg:col-span-4">
            <Field label="Notes" name="notes" error={fields.notes}>
              <Input name="notes" error={fields.notes} />
            </Field>
          </div>
        </div>
      </Card>
      <Card
        title={`Blocks (${rows.length})`}
        action={<span className="text-sm text-ink-faint">sizes in {unit}, weight in kg</span>}
      >
        {fields.blocks && (
          <p id={errorId("blocks")} className="mb-2 text-sm text-ember">
            {fields.blocks}
          </p>
        )}
        <div className="space-y-3">
          {rows.map((r, i) => {
            const grade = grades.find((g) => String(g.id) === r.gradeId);
            const mm = [toMm(r.x), toMm(r.y), toMm(r.z)];
            const vol = mm.every((v) => v && v > 0) ? (mm[0]! * mm[1]! * mm[2]!) / 1e9 : null;
            const density = vol && r.weight ? Number(r.weight) / vol : null;
            const low = density !== null && grade?.minDensity != null && density < grade.minDensity;
            const p = (k: string) => `blocks.${i}.${k}`;
            const rowErrors = Object.entries(fields).filter(([k]) => k.startsWith(`blocks.${i}.`));
            // Said as the buyer types (the server says the same): invisible characters cannot be seen.
            const codeProblem = !fields[p("code")] && r.code.trim() ? receivedCodeProblem(r.code.trim()) : null;
            // Captions above every field on narrow screens; on wide ones the first row's serve as column heads.
            const caption = `mb-0.5 block text-xs font-medium text-ink-soft ${i === 0 ? "" : "lg:hidden"}`;
            return (
              <fieldset key={r.key} className="rounded-md border border-bead p-3" aria-label={`Block ${i + 1}`}>
                <div className="grid grid-cols-2 gap-2 sm:grid-cols-4 lg:grid-cols-[7rem_9rem_repeat(3,5.5rem)_5.5rem_6rem_1fr_9rem]">
                  <Captioned caption="Code" className={caption}>
                    <input
                      aria-label={`Block ${i + 1} code (blank: Blockyard numbers it)`}
                      placeholder="code (auto)"
                      value={r.code}
                      onChange={(e) => update(r.key, { code: e.target.value })}
                      {...(codeProblem
                        ? { "aria-invalid": true as const, "aria-describedby": errorId(p("code")) }
                        : tiedError(fields, p("code")))}
                      className={`${cell} ${codeProblem ? "border-ember" : bad(p("code"))}`}
                    />
                  </Captioned>
                  <Captioned caption="Grade" className={caption}>
                    <select
                      aria-label={`Block ${i + 1} grade`}
                      value={r.gradeId}
                      onChange={(e) => update(r.key, { gradeId: e.target.value })}
                      {...tiedError(fields, p("gradeId"))}
                      className={`${cell} ${bad(p("gradeId"))}`}
                    >
                      <option value="">grade…</option>
                      {grades.map((g) => (
                        <option key={g.id} value={g.id}>
                          {g.code}
                        </option>
                      ))}
                    </select>
                  </Captioned>
                  <Captioned caption={`Length (${unit})`} className={caption}>
                    <input
                      aria-label={`Block ${i + 1} length`}
                      placeholder="length"
                      inputMode="decimal"
                      value={r.x}
                      onChange={(e) => update(r.key, { x: e.target.value })}
                      {...tiedError(fields, p("size.0"))}
                      className={`${cell} ${bad(p("size.0"))}`}
                    />
                  </Captioned>
                  <Captioned caption={`Width (${unit})`} className={caption}>
                    <input
                      aria-label={`Block ${i + 1} width`}
                      placeholder="width"
                      inputMode="decimal"
                      value={r.y}
                      onChange={(e) => update(r.key, { y: e.target.value })}
                      {...tiedError(fields, p("size.1"))}
                      className={`${cell} ${bad(p("size.1"))}`}
                    />
                  </Captioned>
                  <Captioned caption={`Height (${unit})`} className={caption}>
                    <input
                      aria-label={`Block ${i + 1} height`}
                      placeholder="height"
                      inputMode="decimal"
                      value={r.z}
                      onChange={(e) => update(r.key, { z: e.target.value })}
                      {...tiedError(fields, p("size.2"))}
                      className={`${cell} ${bad(p("size.2"))}`}
                    />
                  </Captioned>
                  <Captioned caption="Weight (kg)" className={caption}>
                    <input
                      aria-label={`Block ${i + 1} weight kg`}
                      placeholder="kg"
                      inputMode="decimal"
                      value={r.weight}
                      onChange={(e) => update(r.key, { weight: e.target.value })}
                      {...tiedError(fields, p("weightKg"))}
                      className={`${cell} ${bad(p("weightKg"))}`}
                    />
                  </Captioned>
                  <Captioned caption="Cost" className={caption}>
                    <input
                      aria-label={`Block ${i + 1} cost`}
                      placeholder="cost"
                      inputMode="decimal"
                      value={r.cost}
                      onChange={(e) => update(r.key, { cost: e.target.value })}
                      {...tiedError(fields, p("cost"))}
                      className={`${cell} ${bad(p("cost"))}`}
                    />
                  </Captioned>
                  <Captioned caption="Location" className={caption}>
                    <input
                      aria-label={`Block ${i + 1} location`}
                      placeholder="location"
                      value={r.location}
                      onChange={(e) => update(r.key, { location: e.target.value })}
                      {...tiedError(fields, p("location"))}
                      className={`${cell} ${bad(p("location"))}`}
                    />
                  </Captioned>
                  <Captioned caption="Moulded on" className={caption}>
                    <input
                      aria-label={`Block ${i + 1} moulding date`}
                      type="date"
                      value={r.mouldedOn}
                      onChange={(e) => update(r.key, { mouldedOn: e.target.value })}
                      {...tiedError(fields, p("mouldedOn"))}
                      className={`${cell} ${bad(p("mouldedOn"))}`}
                    />
                  </Captioned>
                </div>
                <div className="mt-2 flex flex-wrap items-center justify-between gap-2 text-xs">
                  <span className="text-ink-soft">
                    {vol !== null && <>{formatVolume(vol)} · </>}
                    {density !== null && (
                      <span className={low ? "font-semibold text-ember" : ""}>
                        {density.toFixed(1)} kg/m³{low && ` — below the ${grade!.code} minimum ${grade!.minDensity}`} ·{" "}
                      </span>
                    )}
                    {grade && <>cut not before {addDays(r.mouldedOn || receivedOn, grade.cureDays)}</>}
                    {grade?.neverHotWire && <span className="ml-1 font-semibold text-ember">· never hot-wire</span>}
                  </span>
                  <span className="flex gap-2">
                    <button
                      type="button"
                      className="min-h-11 rounded-md px-3 text-kerf hover:bg-kerf-light"
                      onClick={() => {
                        const fresh = freshKey();
                        setRows((rs) => copyRow(rs, r.key, fresh));
                      }}
                    >
                      Copy row
                    </button>
                    {rows.length > 1 && (
                      <button
                        type="button"
                        className="min-h-11 rounded-md px-3 text-ember hover:bg-ember-light"
                        onClick={() => setRows((rs) => removeRow(rs, r.key))}
                      >
                        Remove
                      </button>
                    )}
                  </span>
                </div>
                {codeProblem && (
                  <p id={errorId(p("code"))} className="text-sm text-ember">
                    Code: {codeProblem}
                  </p>
                )}
                {rowErrors.map(([k, m]) => (
                  <p key={k} id={errorId(k)} className="text-sm text-ember">
                    {m}
                  </p>
                ))}
              </fieldset>
            );
          })}
        </div>
        <div className="mt-3">
          <Button
            tone="secondary"
            onClick={() => {
              const fresh = freshKey();
              setRows((rs) => [...rs, blankRow(fresh)]);
            }}
          >
            Add a block
          </Button>
        </div>
      </Card>
      <Button type="submit" disabled={busy || rows.length === 0}>
        {busy ? "Saving…" : `Receive ${rows.length} block${rows.length === 1 ? "" : "s"}`}
      </Button>
    </form>
  );
}

/** A field with a small caption above it (the control keeps its own, fuller accessible name). */
function Captioned({ caption, className, children }: { caption: string; className: string; children: ReactNode }) {
  return (
    // biome-ignore lint/a11y/noLabelWithoutControl: the control comes in as children
    <label className="block">
      <span aria-hidden="true" className={className}>
        {caption}
      </span>
      {children}
    </label>
  );
}
