import { NextResponse } from "next/server";
import { api, readJson } from "@/lib/auth/guard";
import { createClaim, listClaims } from "@/db/queries/claims";
import { HttpError } from "@/lib/errors";
import { CLAIM_STATUSES, type ClaimStatus } from "@/lib/stock";
import { claimSchema } from "@/lib/validations/claims";

/** `GET /api/claims?status=open&supplierId=2` → `{ items }`: claims to suppliers, newest first. */
export const GET = api("GET /api/claims", async ({ req }) => {
  const sp = req.nextUrl.searchParams;
  const status = sp.get("status") || undefined;
  if (status && status !== "decided" && !(CLAIM_STATUSES as readonly string[]).includes(status))
    throw new HttpError(400, "status must be open, accepted, rejected, credited or decided.", {
      status: "Use open, accepted, rejected, credited or decided.",
    });
  const supplier = sp.get("supplierId");
  if (supplier && !/^\d{1,9}$/.test(supplier))
    throw new HttpError(400, "supplierId must be a supplier's number.", { supplierId: "Use a supplier's number." });
  return {
    items: await listClaims({
      status: status as ClaimStatus | "decided" | undefined,
      supplierId: supplier ? Number(supplier) : undefined,
    }),
  };
});

/** `POST /api/claims` `{ reason, creditAsked, blocks: ["HF-1047"], note?, supplierId? }` → 201 `{ claim }` */
export const POST = api("POST /api/claims", async ({ req, user }) => {
  const input = await readJson(req, claimSchema);
  return NextResponse.json({ claim: await createClaim(input, user.id) }, { status: 201 });
});
