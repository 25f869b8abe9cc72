import { api, parseWith } from "@/lib/auth/guard";
import { listLedger } from "@/db/queries/ledger";
import { ledgerQuery } from "@/lib/validations/stock";

/**
 * `GET /api/ledger?kind=&from=&to=&block=&pageSize=&before=` → `{ items, total, older }`, newest first.
 * The next page: the same query with `before` = `older` (null: no older entries).
 */
export const GET = api("GET /api/ledger", async ({ req }) => {
  const q = parseWith(ledgerQuery, Object.fromEntries(req.nextUrl.searchParams));
  return listLedger({
    blockId: q.block,
    kind: q.kind,
    from: q.from,
    to: q.to,
    before: q.before,
    page: q.before ? 1 : q.page,
    pageSize: q.pageSize,
  });
});
