import { api, parseWith } from "@/lib/auth/guard";
import { listLedger } from "@/db/queries/ledger";
import { ledgerQuery } from "@/lib/validations/stock";

export const GET = api("GET /api/ledger", async ({ req }) => {
  const q = parseWith(ledgerQuery, Object.fromEntries(req.nextUrl.searchParams));
  return listLedger({ blockId: q.block, kind: q.kind, from: q.from, to: q.to, page: q.page, pageSize: q.pageSize });
});
