import { z } from "zod";
import { api, parseWith } from "@/lib/auth/guard";
import { listOutbox } from "@/db/queries/outbox";

const query = z.object({
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
});

export const GET = api("GET /api/outbox", async ({ req }) =>
  listOutbox(parseWith(query, Object.fromEntries(req.nextUrl.searchParams))),
);
