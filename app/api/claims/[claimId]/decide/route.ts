import { api, readJson } from "@/lib/auth/guard";
import { decideClaim } from "@/db/queries/claims";
import { idParam } from "@/lib/params";
import { claimDecisionSchema } from "@/lib/validations/claims";

type P = { claimId: string };

/**
 * `POST /api/claims/3/decide` `{ outcome: "accepted" | "rejected" | "credited", creditReceived?, note? }`
 * → `{ claim }`: the supplier's answer (an accepted claim may later be credited).
 */
export const POST = api<P>("POST /api/claims/[claimId]/decide", async ({ req, params, user }) => {
  const id = idParam(params.claimId, "That claim");
  const input = await readJson(req, claimDecisionSchema);
  return { claim: await decideClaim(id, input, user.id) };
});
