"use client";

import { numberOrNull as num } from "@/lib/forms";
import { useRouter } from "next/navigation";
import { useState } from "react";
import type { Grade } from "@/db/queries/grades";
import { ApiError, send } from "@/lib/swr/fetcher";
import { Button } from "@/components/ui/button";
import { Badge, Card } from "@/components/ui/card";
import { Field, Input, Select } from "@/components/ui/field";
import { MATERIALS, type Material } from "@/lib/stock";
import { c578Minimum, formatCompressive } from "@/lib/astm-c578";
import { LiveNotice, ResultNotice } from "@/components/ui/result-notice";

/** A grade as the server's query module types it (a type-only import: erased from the client bundle). */
export type GradeView = Grade;

const EMPTY: Omit<GradeView, "id" | "active"> = {
  code: "",
  material: "EPS",
  gradeSystem: "ASTM C578",
  grade: "",
  nominalDensity: null,
  minDensity: null,
  cureDays: 14,
  neverHotWire: false,
  colour: "#7fb0b6",
  priceUnit: "bf",
  notes: null,
};

/** ASTM C578's minimum compressive resistance for the grade's type, if it is a C578 type. */
function compressive(g: GradeView): string {
  const row = c578Minimum(g.material, g.gradeSystem, g.grade);
  return row ? formatCompressive(row) : "–";
}

export function GradeEditor({ grades, canEdit }: { grades: GradeView[]; canEdit: boolean }) {
  const router = useRouter();
  const [editing, setEditing] = useState<GradeView | null>(null);
  const [fields, setFields] = useState<Record<string, string>>({});
  const [msg, setMsg] = useState<{ tone: "success" | "danger"; text: string } | null>(null);
  const [material, setMaterial] = useState<Material>("EPS");
  const g = editing ?? { id: 0, ...EMPTY };

  return (
    <div className="grid gap-5 lg:grid-cols-[1fr_24rem]">
      <Card title="Grades">
        <table>
          <thead>
            <tr>
              <th className="py-2 pr-3">Code</th>
              <th className="px-3 py-2">Material</th>
              <th className="px-3 py-2">Grade</th>
              <th className="px-3 py-2 text-right">Min kg/m³</th>
              <th className="px-3 py-2 text-right" title="ASTM C578 minimum compressive resistance for the type">
                C578 min compressive
              </th>
              <th className="px-3 py-2 text-right">Cure days</th>
              <th className="py-2 pl-3">
                <span className="sr-only">Edit</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {grades.map((x) => (
              <tr key={x.id} className="border-t border-bead/60">
                <td className="whitespace-nowrap py-2 pr-3">
                  <span className="mr-2 inline-block size-3 rounded-sm align-middle" style={{ background: x.colour }} />
                  {x.code}
                </td>
                <td className="px-3 py-2">
                  {x.material} {x.neverHotWire && <Badge tone="ember">never hot-wire</Badge>}
                </td>
                <td className="px-3 py-2">
                  {x.gradeSystem} {x.grade}
                </td>
                <td className="px-3 py-2 text-right tabular-nums">{x.minDensity ?? "–"}</td>
                <td className="whitespace-nowrap px-3 py-2 text-right tabular-nums" data-testid={`c578-${x.code}`}>
                  {compressive(x)}
                </td>
                <td className="px-3 py-2 text-right tabular-nums">{x.cureDays}</td>
                <td className="py-2 pl-3 text-right">
                  {canEdit && (
                    <Button
                      tone="quiet"
                      onClick={() => {
                        setEditing(x);
                        setMaterial(x.material);
                        setFields({});
                        setMsg(null);
                      }}
                    >
                      Edit
                    </Button>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
        <p className="mt-3 text-xs text-ink-faint">
          ASTM C578 sets minimum densities and compressive resistance (at yield or 10 % deformation) by type; EN 13163
          classes (EPS 100, 150…) are compressive-stress classes, not densities. Grade cannot be seen on a block: weigh
          it.
        </p>
      </Card>
      {canEdit && (
        <Card title={editing ? `Edit ${editing.code}` : "Add a grade"}>
          <form
            key={g.id}
            className="space-y-3"
            onSubmit={async (e) => {
              e.preventDefault();
              const fd = new FormData(e.currentTarget);
              const body = {
                code: fd.get("code"),
                material: fd.get("material"),
                gradeSystem: fd.get("gradeSystem"),
                grade: fd.get("grade"),
                nominalDensity: num(fd.get("nominalDensity")),
                minDensity: num(fd.get("minDensity")),
                cureDays: num(fd.get("cureDays")),
                neverHotWire: fd.get("neverHotWire") === "on",
                colour: fd.get("colour"),
                priceUnit: fd.get("priceUnit"),
                notes: fd.get("notes"),
              };
              setFields({});
              try {
                if (editing) await send(`/api/grades/${editing.id}`, "PUT", body);
                else await send("/api/grades", "POST", body);
                setMsg({ tone: "success", text: `Grade ${String(body.code)} saved.` });
                setEditing(null);
                router.refresh();
              } catch (err) {
                if (err instanceof ApiError) {
                  setFields(err.fields ?? {});
                  setMsg({ tone: "danger", text: err.message });
                }
              }
            }}
          >
            {msg && <ResultNotice tone={msg.tone}>{msg.text}</ResultNotice>}
            <Field label="Code" name="code" error={fields.code}>
              <Input name="code" defaultValue={g.code} error={fields.code} />
            </Field>
            <Field label="Material" name="material" error={fields.material}>
              <Select name="material" value={material} onChange={(e) => setMaterial(e.target.value as Material)}>
                {MATERIALS.map((m) => (
                  <option key={m}>{m}</option>
                ))}
              </Select>
            </Field>
            {material === "PU" && (
              <LiveNotice tone="danger">
                Polyurethane is never hot-wired: it gives off isocyanates and hydrogen cyanide. Blockyard keeps the
                “never hot-wire” flag on.
              </LiveNotice>
            )}
            <div className="grid grid-cols-2 gap-3">
              <Field label="Grade system" name="gradeSystem" error={fields.gradeSystem}>
                <Input name="gradeSystem" defaultValue={g.gradeSystem} error={fields.gradeSystem} />
              </Field>
              <Field label="Grade" name="grade" error={fields.grade}>
                <Input name="grade" defaultValue={g.grade} error={fields.grade} />
              </Field>
              <Field label="Nominal kg/m³" name="nominalDensity" error={fields.nominalDensity}>
                <Input
                  name="nominalDensity"
                  inputMode="decimal"
                  defaultValue={g.nominalDensity ?? ""}
                  error={fields.nominalDensity}
                />
              </Field>
              <Field label="Minimum kg/m³" name="minDensity" error={fields.minDensity}>
                <Input
                  name="minDensity"
                  inputMode="decimal"
                  defaultValue={g.minDensity ?? ""}
                  error={fields.minDensity}
                />
              </Field>
              <Field label="Cure days" name="cureDays" error={fields.cureDays}>
                <Input name="cureDays" inputMode="numeric" defaultValue={g.cureDays} error={fields.cureDays} />
              </Field>
              <Field label="Priced per" name="priceUnit" error={fields.priceUnit}>
                <Select name="priceUnit" defaultValue={g.priceUnit}>
                  <option value="bf">board foot</option>
                  <option value="m3">m³</option>
                </Select>
              </Field>
              <Field label="Colour" name="colour" error={fields.colour}>
                <Input name="colour" type="color" defaultValue={g.colour} error={fields.colour} />
              </Field>
            </div>
            <label className="flex min-h-11 items-center gap-2 text-sm">
              <input
                type="checkbox"
                name="neverHotWire"
                className="size-5 accent-ember"
                defaultChecked={g.neverHotWire || material === "PU"}
                key={material}
              />{" "}
              Never hot-wire
            </label>
            {fields.neverHotWire && <p className="text-sm text-ember">{fields.neverHotWire}</p>}
            <Field label="Notes" name="notes" error={fields.notes}>
              <Input name="notes" defaultValue={g.notes ?? ""} />
            </Field>
            <div className="flex gap-2">
              <Button type="submit">{editing ? "Save grade" : "Add grade"}</Button>
              {editing && (
                <Button tone="quiet" onClick={() => setEditing(null)}>
                  Cancel
                </Button>
              )}
            </div>
          </form>
        </Card>
      )}
    </div>
  );
}
