import { api } from "@/lib/auth/guard";
import { endSession } from "@/lib/auth/session";

export const POST = api("POST /api/auth/sign-out", async () => {
  await endSession();
  return { ok: true };
});
