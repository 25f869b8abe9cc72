"use server";

import { redirect } from "next/navigation";
import { signIn } from "@/lib/auth/sign-in";
import { endSession } from "@/lib/auth/session";
import { HttpError, isDatabaseDown } from "@/lib/errors";

export interface SignInState {
  error?: string;
  email?: string;
}

export async function signInAction(_prev: SignInState, form: FormData): Promise<SignInState> {
  const email = String(form.get("email") ?? "");
  const password = String(form.get("password") ?? "");
  try {
    await signIn(email, password);
  } catch (e) {
    if (e instanceof HttpError) return { error: e.message, email };
    if (isDatabaseDown(e)) return { error: "The database cannot be reached. Try again in a moment.", email };
    throw e;
  }
  redirect("/");
}

export async function signOutAction(): Promise<void> {
  await endSession();
  redirect("/sign-in");
}
