"use client";

import { useState } from "react";
import { ApiError } from "@/lib/swr/fetcher";

export type Message = { tone: "success" | "danger"; text: string } | null;

/**
 * The life of a form that sends to the API: busy while it waits, the server's field errors by
 * name, and one message on top.
 *
 *   const form = useSubmit();
 *   await form.submit(() => send("/api/settings", "PUT", body), { ok: "Saved.", failed: "Not saved." });
 */
export function useSubmit() {
  const [busy, setBusy] = useState(false);
  const [fields, setFields] = useState<Record<string, string>>({});
  const [message, setMessage] = useState<Message>(null);

  async function submit<T>(action: () => Promise<T>, text: { ok?: string; failed: string }): Promise<T | undefined> {
    setBusy(true);
    setFields({});
    setMessage(null);
    try {
      const result = await action();
      if (text.ok) setMessage({ tone: "success", text: text.ok });
      return result;
    } catch (err) {
      if (err instanceof ApiError) {
        setFields(err.fields ?? {});
        setMessage({ tone: "danger", text: err.message });
      } else setMessage({ tone: "danger", text: text.failed });
      return undefined;
    } finally {
      setBusy(false);
    }
  }

  return { busy, fields, message, setFields, setMessage, submit };
}
