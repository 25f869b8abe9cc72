import { api } from "@/lib/auth/guard";
import { getClaim } from "@/db/queries/claims";
import { notFound } from "@/lib/errors";
import { idParam } from "@/lib/params";

type P = { claimId: string };

/** `GET /api/claims/3` → `{ claim }` with its blocks and photos. */
export const GET = api<P>("GET /api/claims/[claimId]", async ({ params }) => {
  const id = idParam(params.claimId, "That claim");
  const claim = await getClaim(id);
  if (!claim) throw notFound("That claim");
  return { claim };
});
