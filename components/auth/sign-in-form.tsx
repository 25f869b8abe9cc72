"use client";

import { useActionState } from "react";
import { signInAction, type SignInState } from "@/app/(auth)/actions";
import { Field, Input } from "@/components/ui/field";
import { Button } from "@/components/ui/button";
import { ResultNotice } from "@/components/ui/result-notice";

export function SignInForm() {
  const [state, action, pending] = useActionState<SignInState, FormData>(signInAction, {});
  return (
    <form action={action} className="space-y-4" noValidate>
      {state.error && <ResultNotice tone="danger">{state.error}</ResultNotice>}
      <Field label="E-mail" name="email">
        <Input name="email" type="email" autoComplete="username" required defaultValue={state.email} autoFocus />
      </Field>
      <Field label="Password" name="password">
        <Input name="password" type="password" autoComplete="current-password" required />
      </Field>
      <Button type="submit" disabled={pending} className="w-full">
        {pending ? "Checking…" : "Sign in"}
      </Button>
    </form>
  );
}
