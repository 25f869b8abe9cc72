import { api, parseWith } from "@/lib/auth/guard";
import { listBlocks } from "@/db/queries/blocks";
import { blockQuerySchema } from "@/lib/validations/stock";

/** `GET /api/blocks?status=ready&grade=2&sort=received&page=1` → `{ items, total, totals, page, pageSize }` */
export const GET = api("GET /api/blocks", async ({ req }) => {
  const q = parseWith(blockQuerySchema, Object.fromEntries(req.nextUrl.searchParams));
  return listBlocks(q);
});
