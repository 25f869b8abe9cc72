"use client";

import { useState } from "react";
import { ApiError, send } from "@/lib/swr/fetcher";
import { Field, Input } from "@/components/ui/field";
import { Button } from "@/components/ui/button";
import { Notice } from "@/components/ui/card";

export function PasswordForm() {
  const [fields, setFields] = useState<Record<string, string>>({});
  const [message, setMessage] = useState<{ tone: "success" | "danger"; text: string } | null>(null);
  const [busy, setBusy] = useState(false);
  return (
    <form
      className="max-w-md space-y-4"
      onSubmit={async (e) => {
        e.preventDefault();
        const form = e.currentTarget;
        const fd = new FormData(form);
        setFields({});
        setMessage(null);
        if (fd.get("newPassword") !== fd.get("repeat")) {
          setFields({ repeat: "The two new passwords differ." });
          return;
        }
        setBusy(true);
        try {
          await send("/api/me/password", "POST", { currentPassword: fd.get("currentPassword"), newPassword: fd.get("newPassword") });
          form.reset();
          setMessage({ tone: "success", text: "Password changed. Your other sessions were signed out." });
        } catch (err) {
          if (err instanceof ApiError) {
            setFields(err.fields ?? {});
            setMessage({ tone: "danger", text: err.message });
          } else setMessage({ tone: "danger", text: "The password was not changed." });
        } finally {
          setBusy(false);
        }
      }}
    >
      {message && <Notice tone={message.tone}>{message.text}</Notice>}
      <Field label="Current password" name="currentPassword" error={fields.currentPassword}>
        <Input name="currentPassword" type="password" autoComplete="current-password" error={fields.currentPassword} />
      </Field>
      <Field label="New password" name="newPassword" error={fields.newPassword} hint="At least 10 characters.">
        <Input name="newPassword" type="password" autoComplete="new-password" error={fields.newPassword} />
      </Field>
      <Field label="New password again" name="repeat" error={fields.repeat}>
        <Input name="repeat" type="password" autoComplete="new-password" error={fields.repeat} />
      </Field>
      <Button type="submit" disabled={busy}>{busy ? "Saving…" : "Change password"}</Button>
    </form>
  );
}
