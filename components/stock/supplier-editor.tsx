"use client";

import { plural } from "@/lib/format";
import { useRouter } from "next/navigation";
import { useState } from "react";
import type { Supplier } from "@/db/queries/suppliers";
import { ApiError, send } from "@/lib/swr/fetcher";
import { Button } from "@/components/ui/button";
import { Badge, Card } from "@/components/ui/card";
import { Field, Input } from "@/components/ui/field";
import { ResultNotice } from "@/components/ui/result-notice";

/** A supplier as the server's query module types it (a type-only import: erased from the client bundle). */
export type SupplierView = Supplier;

export function SupplierEditor({ suppliers }: { suppliers: SupplierView[] }) {
  const router = useRouter();
  const [editing, setEditing] = useState<SupplierView | null>(null);
  const [fields, setFields] = useState<Record<string, string>>({});
  const [msg, setMsg] = useState<{ tone: "success" | "danger"; text: string } | null>(null);
  const s = editing ?? {
    id: 0,
    name: "",
    contact: "",
    email: "",
    phone: "",
    leadTimeDays: 14,
    leadTimeSdDays: 0,
    notes: "",
    active: true,
  };
  return (
    <div className="grid gap-5 lg:grid-cols-[1fr_24rem]">
      <Card title="Suppliers">
        <ul className="divide-y divide-bead">
          {suppliers.map((x) => (
            <li key={x.id} className="flex flex-wrap items-center justify-between gap-3 py-3 text-sm">
              <div>
                <p className="font-medium">
                  {x.name} {!x.active && <Badge tone="ember">not used</Badge>}
                </p>
                <p className="text-ink-soft">
                  {[x.contact, x.email, x.phone].filter(Boolean).join(" · ") || "no contact yet"}
                </p>
                <p className="text-ink-faint">
                  Lead time {plural(x.leadTimeDays, "working day")}
                  {x.leadTimeSdDays ? ` ± ${x.leadTimeSdDays}` : ""}
                </p>
              </div>
              <Button
                tone="quiet"
                onClick={() => {
                  setEditing(x);
                  setFields({});
                  setMsg(null);
                }}
              >
                Edit
              </Button>
            </li>
          ))}
        </ul>
      </Card>
      <Card title={editing ? `Edit ${editing.name}` : "Add a supplier"}>
        <form
          key={s.id}
          className="space-y-3"
          onSubmit={async (e) => {
            e.preventDefault();
            const fd = new FormData(e.currentTarget);
            const body = {
              name: fd.get("name"),
              contact: fd.get("contact"),
              email: fd.get("email"),
              phone: fd.get("phone"),
              leadTimeDays: fd.get("leadTimeDays") === "" ? null : Number(fd.get("leadTimeDays")),
              leadTimeSdDays: fd.get("leadTimeSdDays") === "" ? 0 : Number(fd.get("leadTimeSdDays")),
              notes: fd.get("notes"),
              active: fd.get("active") === "on",
            };
            setFields({});
            try {
              if (editing) await send(`/api/suppliers/${editing.id}`, "PUT", body);
              else await send("/api/suppliers", "POST", body);
              setMsg({ tone: "success", text: `${String(body.name)} saved.` });
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
          <Field label="Name" name="name" error={fields.name}>
            <Input name="name" defaultValue={s.name} error={fields.name} />
          </Field>
          <Field label="Contact" name="contact" error={fields.contact}>
            <Input name="contact" defaultValue={s.contact ?? ""} />
          </Field>
          <Field label="E-mail for orders" name="email" error={fields.email}>
            <Input name="email" type="email" defaultValue={s.email ?? ""} error={fields.email} />
          </Field>
          <Field label="Phone" name="phone" error={fields.phone}>
            <Input name="phone" defaultValue={s.phone ?? ""} />
          </Field>
          <Field label="Lead time (working days)" name="leadTimeDays" error={fields.leadTimeDays}>
            <Input name="leadTimeDays" inputMode="numeric" defaultValue={s.leadTimeDays} error={fields.leadTimeDays} />
          </Field>
          <Field
            label="Lead time spread, σL (working days)"
            name="leadTimeSdDays"
            error={fields.leadTimeSdDays}
            hint="How far deliveries stray from the promised day. Once three orders with a promised date have come, the reorder list works it out from them."
          >
            <Input
              name="leadTimeSdDays"
              inputMode="decimal"
              defaultValue={s.leadTimeSdDays ?? 0}
              error={fields.leadTimeSdDays}
            />
          </Field>
          <Field label="Notes" name="notes">
            <Input name="notes" defaultValue={s.notes ?? ""} />
          </Field>
          <label className="flex min-h-11 items-center gap-2 text-sm">
            <input type="checkbox" name="active" defaultChecked={s.active} className="size-5 accent-kerf" /> We still
            buy from them
          </label>
          <div className="flex gap-2">
            <Button type="submit">{editing ? "Save supplier" : "Add supplier"}</Button>
            {editing && (
              <Button tone="quiet" onClick={() => setEditing(null)}>
                Cancel
              </Button>
            )}
          </div>
        </form>
      </Card>
    </div>
  );
}
