"use client";

import { numberOrNull as num } from "@/lib/forms";
import { send } from "@/lib/swr/fetcher";
import { useSubmit } from "@/components/ui/use-submit";
import type { ShopSettings } from "@/lib/validations/settings";
import { Field, Input, Select } from "@/components/ui/field";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { ResultNotice } from "@/components/ui/result-notice";

export function SettingsForm({ initial }: { initial: ShopSettings }) {
  const { busy, fields, message, submit } = useSubmit();
  const s = initial;
  return (
    <form
      className="space-y-6"
      onSubmit={async (e) => {
        e.preventDefault();
        const fd = new FormData(e.currentTarget);
        await submit(
          () =>
            send("/api/settings", "PUT", {
              shopName: fd.get("shopName"),
              displayUnits: fd.get("displayUnits"),
              kerf: num(fd.get("kerf")),
              trim: num(fd.get("trim")),
              defectMargin: num(fd.get("defectMargin")),
              minOffcut: [num(fd.get("minOffcut.0")), num(fd.get("minOffcut.1")), num(fd.get("minOffcut.2"))],
              layout: fd.get("layout"),
              feedMmPerMin: num(fd.get("feedMmPerMin")),
              nestingTimeLimitMs: num(fd.get("nestingTimeLimitMs")),
            }),
          { ok: "Shop settings saved. New nesting runs start from these.", failed: "Settings were not saved." },
        );
      }}
    >
      {message && <ResultNotice tone={message.tone}>{message.text}</ResultNotice>}
      <Card title="The shop">
        <div className="grid gap-4 md:grid-cols-2">
          <Field label="Shop name" name="shopName" error={fields.shopName}>
            <Input name="shopName" defaultValue={s.shopName} error={fields.shopName} />
          </Field>
          <Field label="Show lengths in" name="displayUnits" error={fields.displayUnits}>
            <Select name="displayUnits" defaultValue={s.displayUnits}>
              <option value="mm">millimetres</option>
              <option value="in">inches</option>
            </Select>
          </Field>
        </div>
      </Card>
      <Card title="Cutting defaults (mm)">
        <p className="mb-4 text-sm text-ink-soft">
          Kerf depends on the wire, its heat and the feed: calibrate it per machine and material with a test cut.
        </p>
        <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
          <Field label="Kerf" name="kerf" error={fields.kerf}>
            <Input name="kerf" inputMode="decimal" defaultValue={s.kerf} error={fields.kerf} />
          </Field>
          <Field label="Face trim per face" name="trim" error={fields.trim}>
            <Input name="trim" inputMode="decimal" defaultValue={s.trim} error={fields.trim} />
          </Field>
          <Field label="Clearance around defects" name="defectMargin" error={fields.defectMargin}>
            <Input name="defectMargin" inputMode="decimal" defaultValue={s.defectMargin} error={fields.defectMargin} />
          </Field>
          <Field label="Smallest offcut kept: length" name="minOffcut.0" error={fields["minOffcut.0"]}>
            <Input name="minOffcut.0" inputMode="decimal" defaultValue={s.minOffcut[0]} error={fields["minOffcut.0"]} />
          </Field>
          <Field label="… width" name="minOffcut.1" error={fields["minOffcut.1"]}>
            <Input name="minOffcut.1" inputMode="decimal" defaultValue={s.minOffcut[1]} error={fields["minOffcut.1"]} />
          </Field>
          <Field label="… height" name="minOffcut.2" error={fields["minOffcut.2"]}>
            <Input name="minOffcut.2" inputMode="decimal" defaultValue={s.minOffcut[2]} error={fields["minOffcut.2"]} />
          </Field>
          <Field
            label="Layout rule"
            name="layout"
            error={fields.layout}
            hint="Guillotine: every piece comes free by through cuts. Free: for comparing with box-packing figures; a plan no cutter can follow cannot be approved."
          >
            <Select name="layout" defaultValue={s.layout}>
              <option value="guillotine">guillotine (through cuts only)</option>
              <option value="layers">layers (slabs, then profiles)</option>
              <option value="free">free (comparison only: may not be cuttable, cannot be approved then)</option>
            </Select>
          </Field>
          <Field label="Feed rate (mm/min)" name="feedMmPerMin" error={fields.feedMmPerMin}>
            <Input name="feedMmPerMin" inputMode="decimal" defaultValue={s.feedMmPerMin} error={fields.feedMmPerMin} />
          </Field>
          <Field label="Nesting time budget (ms)" name="nestingTimeLimitMs" error={fields.nestingTimeLimitMs}>
            <Input
              name="nestingTimeLimitMs"
              inputMode="numeric"
              defaultValue={s.nestingTimeLimitMs}
              error={fields.nestingTimeLimitMs}
            />
          </Field>
        </div>
      </Card>
      <Button type="submit" disabled={busy}>
        {busy ? "Saving…" : "Save settings"}
      </Button>
    </form>
  );
}
