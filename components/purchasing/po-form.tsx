"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { ApiError, send } from "@/lib/swr/fetcher";
import { Button } from "@/components/ui/button";
import { Card, Notice } from "@/components/ui/card";
import { Field, Input, Select } from "@/components/ui/field";
import { priceFor } from "@/lib/purchasing/pricing";
import { formatMoney } from "@/lib/format";
import type { PoLine } from "@/lib/purchasing/orders";
import type { Vec3 } from "@/lib/nesting";

interface GradeOpt {
  id: number;
  code: string;
  priceUnit: "m3" | "bf";
  blockSize: Vec3 | null;
  lastPrice: number | null;
}
interface Line {
  gradeId: string;
  x: string;
  y: string;
  z: string;
  quantity: string;
  price: string;
  note: string;
}
export interface PoFormInitial {
  id?: number;
  supplierId: number | null;
  expectedOn: string | null;
  notes: string | null;
  lines: Pick<PoLine, "gradeId" | "size" | "quantity" | "price" | "note">[];
}

const money = formatMoney;

/** Writes or edits a draft order: supplier, date, lines of block size × quantity at a price in the grade's unit. */
export function PoForm({
  grades,
  suppliers,
  initial,
}: {
  grades: GradeOpt[];
  suppliers: { id: number; name: string; email: string | null }[];
  initial?: PoFormInitial;
}) {
  const router = useRouter();
  const blank = (): Line => ({ gradeId: "", x: "", y: "", z: "", quantity: "1", price: "", note: "" });
  const [lines, setLines] = useState<Line[]>(
    initial?.lines.map((l) => ({
      gradeId: String(l.gradeId),
      x: String(l.size[0]),
      y: String(l.size[1]),
      z: String(l.size[2]),
      quantity: String(l.quantity),
      price: String(l.price),
      note: l.note ?? "",
    })) ?? [blank()],
  );
  const [fields, setFields] = useState<Record<string, string>>({});
  const [msg, setMsg] = useState<string | null>(null);
  const set = (i: number, patch: Partial<Line>) => setLines(lines.map((l, j) => (j === i ? { ...l, ...patch } : l)));
  const total = lines.reduce((s, l) => {
    const g = grades.find((x) => String(x.id) === l.gradeId);
    const v = (Number(l.x) * Number(l.y) * Number(l.z) * Number(l.quantity)) / 1e9;
    return g && v > 0 && Number(l.price) >= 0 ? s + priceFor(v, Number(l.price), g.priceUnit) : s;
  }, 0);
  const numOrNull = (v: string) => (v.trim() === "" ? null : Number(v));

  return (
    <form
      className="space-y-5"
      onSubmit={async (e) => {
        e.preventDefault();
        const fd = new FormData(e.currentTarget);
        const body = {
          supplierId: numOrNull(String(fd.get("supplierId") ?? "")),
          expectedOn: String(fd.get("expectedOn") ?? "") || null,
          notes: fd.get("notes"),
          lines: lines.map((l) => ({
            gradeId: numOrNull(l.gradeId),
            size: [numOrNull(l.x), numOrNull(l.y), numOrNull(l.z)],
            quantity: numOrNull(l.quantity),
            price: numOrNull(l.price),
            note: l.note,
          })),
        };
        setFields({});
        try {
          const r = initial?.id
            ? await send<{ order: { id: number } }>(`/api/purchase-orders/${initial.id}`, "PUT", body)
            : await send<{ order: { id: number } }>("/api/purchase-orders", "POST", body);
          router.push(`/purchasing/orders/${r.order.id}`);
          router.refresh();
        } catch (err) {
          if (err instanceof ApiError) {
            setFields(err.fields ?? {});
            setMsg(err.message);
          }
        }
      }}
    >
      {msg && <Notice tone="danger">{msg}</Notice>}
      <Card title="Order">
        <div className="grid gap-3 sm:grid-cols-2">
          <Field label="Supplier" name="supplierId" error={fields.supplierId}>
            <Select name="supplierId" defaultValue={initial?.supplierId ?? ""} error={fields.supplierId}>
              <option value="">Choose…</option>
              {suppliers.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.name}
                  {s.email ? "" : " (no e-mail)"}
                </option>
              ))}
            </Select>
          </Field>
          <Field label="Expected by" name="expectedOn" error={fields.expectedOn}>
            <Input type="date" name="expectedOn" defaultValue={initial?.expectedOn ?? ""} error={fields.expectedOn} />
          </Field>
          <div className="sm:col-span-2">
            <Field label="Notes for the supplier" name="notes" error={fields.notes}>
              <Input name="notes" defaultValue={initial?.notes ?? ""} />
            </Field>
          </div>
        </div>
      </Card>
      <Card
        title="Lines"
        action={
          <Button tone="quiet" onClick={() => setLines([...lines, blank()])}>
            Add a line
          </Button>
        }
      >
        {fields.lines && <p className="mb-2 text-sm text-ember">{fields.lines}</p>}
        <div className="space-y-4">
          {lines.map((l, i) => {
            const g = grades.find((x) => String(x.id) === l.gradeId);
            const err = (k: string) => fields[`lines.${i}.${k}`];
            return (
              <fieldset
                key={i}
                className="grid grid-cols-2 gap-3 rounded-md border border-bead p-3 sm:grid-cols-4 lg:grid-cols-8"
                aria-label={`Line ${i + 1}`}
              >
                <div className="col-span-2">
                  <Field label={`Line ${i + 1}: grade`} name={`grade-${i}`} error={err("gradeId")}>
                    <Select
                      id={`grade-${i}`}
                      value={l.gradeId}
                      error={err("gradeId")}
                      onChange={(e) => {
                        const ng = grades.find((x) => String(x.id) === e.target.value);
                        set(i, {
                          gradeId: e.target.value,
                          ...(ng?.blockSize && !l.x
                            ? { x: String(ng.blockSize[0]), y: String(ng.blockSize[1]), z: String(ng.blockSize[2]) }
                            : {}),
                          ...(ng?.lastPrice && !l.price ? { price: String(ng.lastPrice) } : {}),
                        });
                      }}
                    >
                      <option value="">Choose…</option>
                      {grades.map((x) => (
                        <option key={x.id} value={x.id}>
                          {x.code}
                        </option>
                      ))}
                    </Select>
                  </Field>
                </div>
                {(["x", "y", "z"] as const).map((a, k) => (
                  <Field
                    key={a}
                    label={["Length mm", "Width mm", "Height mm"][k]!}
                    name={`${a}-${i}`}
                    error={err(`size.${k}`)}
                  >
                    <Input
                      id={`${a}-${i}`}
                      inputMode="decimal"
                      value={l[a]}
                      onChange={(e) => set(i, { [a]: e.target.value })}
                      error={err(`size.${k}`)}
                    />
                  </Field>
                ))}
                <Field label="Blocks" name={`qty-${i}`} error={err("quantity")}>
                  <Input
                    id={`qty-${i}`}
                    inputMode="numeric"
                    value={l.quantity}
                    onChange={(e) => set(i, { quantity: e.target.value })}
                    error={err("quantity")}
                  />
                </Field>
                <Field
                  label={g ? `Price per ${g.priceUnit === "bf" ? "BF" : "m³"}` : "Price"}
                  name={`price-${i}`}
                  error={err("price")}
                >
                  <Input
                    id={`price-${i}`}
                    inputMode="decimal"
                    value={l.price}
                    onChange={(e) => set(i, { price: e.target.value })}
                    error={err("price")}
                  />
                </Field>
                <div className="flex items-end">
                  {lines.length > 1 && (
                    <Button tone="quiet" onClick={() => setLines(lines.filter((_, j) => j !== i))}>
                      Remove
                    </Button>
                  )}
                </div>
              </fieldset>
            );
          })}
        </div>
        <p className="mt-3 text-sm text-ink-soft">
          Total about <strong>{money(total)}</strong>. Deliveries within ±10 % of each line are accepted.
        </p>
      </Card>
      <Button type="submit">{initial?.id ? "Save draft" : "Save as draft"}</Button>
    </form>
  );
}
