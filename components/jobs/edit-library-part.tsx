"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { send } from "@/lib/swr/fetcher";
import { Button } from "@/components/ui/button";

import { Field, Input, Select } from "@/components/ui/field";
import { useSubmit } from "@/components/ui/use-submit";
import { ROTATE_LABELS, ROTATE_RULES, type LibraryPart } from "@/lib/job-terms";
import { lengthInUnit, type LengthUnit } from "@/lib/units";
import { fieldError, lengthMmOrNull, numberOrNull as num } from "@/lib/forms";
import { ResultNotice } from "@/components/ui/result-notice";

/**
 * Edits a library part in place: name, kit, usual quantity, grade, turning and notes, and the box
 * of a plain box part (a profile part's box follows its profile; add it again to change the shape).
 * Jobs that already took the part keep their own copy.
 */
export function EditLibraryPart({
  part,
  grades,
  unit,
  onDone,
}: {
  part: LibraryPart;
  grades: { id: number; code: string }[];
  unit: LengthUnit;
  onDone: () => void;
}) {
  const router = useRouter();
  const [v, setV] = useState<Record<string, string>>({
    name: part.name,
    kit: part.kit ?? "",
    quantity: String(part.defaultQuantity),
    gradeId: part.gradeId === null ? "" : String(part.gradeId),
    rotate: part.rotate,
    notes: part.notes ?? "",
    length: String(lengthInUnit(part.size[0], unit)),
    width: String(lengthInUnit(part.size[1], unit)),
    height: String(lengthInUnit(part.size[2], unit)),
  });
  const form = useSubmit();
  const set = (k: string) => (e: { target: { value: string } }) => setV((s) => ({ ...s, [k]: e.target.value }));
  const len = (s: string | undefined) => lengthMmOrNull(s ?? "", unit);
  const err = (...keys: string[]) => fieldError(form.fields, ...keys);

  async function save() {
    const saved = await form.submit(
      async () => {
        await send(`/api/library/${part.id}`, "PATCH", {
          name: v.name ?? "",
          kit: v.kit ?? "",
          defaultQuantity: num(v.quantity ?? ""),
          gradeId: v.gradeId ? Number(v.gradeId) : null,
          rotate: v.rotate,
          notes: v.notes ?? "",
          ...(part.profile ? {} : { size: [len(v.length), len(v.width), len(v.height)] }),
        });
        return true;
      },
      { failed: "That did not work; nothing was changed." },
    );
    if (!saved) return;
    router.refresh();
    onDone();
  }

  return (
    <form
      className="col-span-full space-y-3 rounded-md border border-bead bg-paper-sunk p-3"
      aria-label={`Edit ${part.name}`}
      onSubmit={(e) => {
        e.preventDefault();
        void save();
      }}
    >
      {form.message && <ResultNotice tone={form.message.tone}>{form.message.text}</ResultNotice>}
      <div className="grid gap-3 sm:grid-cols-2">
        <Field label="Part name" name="name" error={err("name")}>
          <Input name="name" value={v.name} onChange={set("name")} error={err("name")} />
        </Field>
        <Field label="Kit" name="kit" error={err("kit")}>
          <Input name="kit" value={v.kit} onChange={set("kit")} error={err("kit")} />
        </Field>
        <Field label="Usual quantity" name="defaultQuantity" error={err("defaultQuantity")}>
          <Input
            name="defaultQuantity"
            inputMode="numeric"
            value={v.quantity}
            onChange={set("quantity")}
            error={err("defaultQuantity")}
          />
        </Field>
        <Field label="Grade" name="gradeId" error={err("gradeId")} hint="Empty: any grade will do.">
          <Select name="gradeId" value={v.gradeId} onChange={set("gradeId")} error={err("gradeId")}>
            <option value="">Any grade</option>
            {grades.map((g) => (
              <option key={g.id} value={g.id}>
                {g.code}
              </option>
            ))}
          </Select>
        </Field>
        <Field label="Turning in the block" name="rotate" error={err("rotate")}>
          <Select name="rotate" value={v.rotate} onChange={set("rotate")} error={err("rotate")}>
            {ROTATE_RULES.map((r) => (
              <option key={r} value={r}>
                {ROTATE_LABELS[r]}
              </option>
            ))}
          </Select>
        </Field>
        <Field label="Notes" name="notes" error={err("notes")}>
          <Input name="notes" value={v.notes} onChange={set("notes")} error={err("notes")} />
        </Field>
      </div>
      {!part.profile && (
        <div className="grid gap-3 sm:grid-cols-3">
          <Field label={`Length ${unit}`} name="length" error={err("size.0", "size")}>
            <Input
              name="length"
              inputMode="decimal"
              value={v.length}
              onChange={set("length")}
              error={err("size.0", "size")}
            />
          </Field>
          <Field label={`Width ${unit}`} name="width" error={err("size.1")}>
            <Input name="width" inputMode="decimal" value={v.width} onChange={set("width")} error={err("size.1")} />
          </Field>
          <Field label={`Height ${unit}`} name="height" error={err("size.2")}>
            <Input name="height" inputMode="decimal" value={v.height} onChange={set("height")} error={err("size.2")} />
          </Field>
        </div>
      )}
      <div className="flex flex-wrap gap-2">
        <Button type="submit" disabled={form.busy}>
          Save the part
        </Button>
        <Button type="button" tone="quiet" onClick={onDone}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
