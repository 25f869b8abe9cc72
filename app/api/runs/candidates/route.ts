import { z } from "zod";
import { api, parseWith } from "@/lib/auth/guard";
import { candidateStock } from "@/db/queries/run-plan";

const query = z.object({
  jobs: z
    .string({ error: "Name the jobs, e.g. jobs=1,2." })
    .regex(/^\d+(,\d+)*$/, "Use job numbers separated by commas.")
    .transform((s) => s.split(",").map(Number)),
});

/**
 * Stock proposed for planning these jobs: ready, of the needed grades, able to hold some part,
 * oldest first (`items`); the ready blocks that cannot hold any, each with the reason (`leftOut`).
 */
export const GET = api("GET /api/runs/candidates", async ({ req }) => {
  const q = parseWith(query, Object.fromEntries(req.nextUrl.searchParams));
  return await candidateStock(q.jobs);
});
