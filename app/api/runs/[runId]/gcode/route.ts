import { z } from "zod";
import { api, parseWith } from "@/lib/auth/guard";
import { getRun } from "@/db/queries/runs";
import { getShopSettings } from "@/db/queries/settings";
import { notFound } from "@/lib/errors";
import { idParam } from "@/lib/params";
import { gcode } from "@/lib/planning/gcode";

type P = { runId: string };
const NAME_BLOCK = "Name the block, e.g. block=HF-1001.";
const query = z.object({ block: z.string({ error: NAME_BLOCK }).min(1, NAME_BLOCK).max(40, NAME_BLOCK) });

/** Straight through cuts of one block of the plan as G-code (ISO 6983 subset). Dry-run first. */
export const GET = api<P>("GET /api/runs/[runId]/gcode", async ({ req, params }) => {
  const { block } = parseWith(query, Object.fromEntries(req.nextUrl.searchParams));
  const run = await getRun(idParam(params.runId, "That plan"));
  const b = run?.problem.blocks.find((x) => x.id === block);
  if (!run?.plan || !b) throw notFound("That block in this plan");
  const { feedMmPerMin } = await getShopSettings();
  const program = gcode({
    code: b.id,
    size: b.size,
    cuts: run.plan.cuts[b.id] ?? [],
    kerf: run.settings.kerf,
    feed: feedMmPerMin,
  });
  return new Response(program, {
    headers: {
      "content-type": "text/plain; charset=utf-8",
      "content-disposition": `attachment; filename="plan-${run.id}-${b.id.replace(/[^\w.-]/g, "_")}.nc"`,
    },
  });
});
