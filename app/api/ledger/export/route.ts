import { api, parseWith } from "@/lib/auth/guard";
import { listLedgerEntries } from "@/db/queries/ledger";
import { csvResponse, toCsv } from "@/lib/csv";
import { isoDate } from "@/lib/stock";
import { ledgerQuery } from "@/lib/validations/stock";

export const GET = api("GET /api/ledger/export", async ({ req }) => {
  const q = parseWith(ledgerQuery, { ...Object.fromEntries(req.nextUrl.searchParams), page: 1, pageSize: 500 });
  const rows: Record<string, unknown>[] = [];
  for (let page = 1; page <= 400; page++) {
    const items = await listLedgerEntries({
      blockId: q.block,
      kind: q.kind,
      from: q.from,
      to: q.to,
      page,
      pageSize: 500,
    });
    for (const e of items) {
      rows.push({
        at: e.at,
        block: e.blockCode,
        kind: e.kind,
        volume_m3: e.volumeM3,
        change_m3: e.deltaM3,
        value: e.value,
        change_value: e.deltaValue,
        user: e.user,
        reason: e.reason,
        ref: e.ref,
      });
    }
    if (items.length < 500) break;
  }
  return csvResponse(
    toCsv(rows, ["at", "block", "kind", "volume_m3", "change_m3", "value", "change_value", "user", "reason", "ref"]),
    `blockyard-ledger-${isoDate()}.csv`,
  );
});
