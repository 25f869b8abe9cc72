"use client";

import { useRouter } from "next/navigation";
import { send } from "@/lib/swr/fetcher";
import { useSubmit } from "@/components/ui/use-submit";
import { Field, Input } from "@/components/ui/field";
import { Button } from "@/components/ui/button";
import { ResultNotice } from "@/components/ui/result-notice";

export function PasswordForm() {
  const { busy, fields, message, setFields, submit } = useSubmit();
  const router = useRouter();
  return (
    <form
      className="max-w-md space-y-4"
      onSubmit={async (e) => {
        e.preventDefault();
        const form = e.currentTarget;
        const fd = new FormData(form);
        if (fd.get("newPassword") !== fd.get("repeat")) {
          setFields({ repeat: "The two new passwords differ." });
          return;
        }
        const done = await submit(
          () =>
            send("/api/me/password", "POST", {
              currentPassword: fd.get("currentPassword"),
              newPassword: fd.get("newPassword"),
            }),
          {
            ok: "Password changed. Your other sessions were signed out.",
            failed: "The password was not changed.",
          },
        );
        if (done) {
          form.reset();
          router.refresh(); // the temporary-password banner goes away
        }
      }}
    >
      {message && <ResultNotice tone={message.tone}>{message.text}</ResultNotice>}
      <Field label="Current password" name="currentPassword" error={fields.currentPassword}>
        <Input name="currentPassword" type="password" autoComplete="current-password" error={fields.currentPassword} />
      </Field>
      <Field label="New password" name="newPassword" error={fields.newPassword} hint="At least 10 characters.">
        <Input name="newPassword" type="password" autoComplete="new-password" error={fields.newPassword} />
      </Field>
      <Field label="New password again" name="repeat" error={fields.repeat}>
        <Input name="repeat" type="password" autoComplete="new-password" error={fields.repeat} />
      </Field>
      <Button type="submit" disabled={busy}>
        {busy ? "Saving…" : "Change password"}
      </Button>
    </form>
  );
}
