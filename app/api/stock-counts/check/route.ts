import { api, parseWith } from "@/lib/auth/guard";
import { checkCountedBlock } from "@/db/queries/stock-counts";
import { countCheckSchema } from "@/lib/validations/stock-count";

/** `GET /api/stock-counts/check?code=HF-1001` → `{ block }`: a scanned block as the register has it (404/409 naming it). */
export const GET = api("GET /api/stock-counts/check", async ({ req }) => {
  const { code } = parseWith(countCheckSchema, { code: req.nextUrl.searchParams.get("code") ?? "" });
  return { block: await checkCountedBlock(code) };
});
