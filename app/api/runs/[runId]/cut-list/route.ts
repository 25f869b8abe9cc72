import { api } from "@/lib/auth/guard";
import { getRun } from "@/db/queries/runs";
import { notFound } from "@/lib/errors";
import { idParam } from "@/lib/params";
import { csvResponse, toCsv } from "@/lib/csv";
import { keyNamer, memberList, slabMembers } from "@/lib/planning/slabs";

type P = { runId: string };
const r2 = (v: number) => Math.round(v * 100) / 100;

/**
 * The plan as a cut list: one row per part placed, in block order, with its position and size; a
 * slab of a true-shape plan is one row with its members listed in the last column.
 */
export const GET = api<P>("GET /api/runs/[runId]/cut-list", async ({ params }) => {
  const run = await getRun(idParam(params.runId, "That plan"));
  if (!run?.plan) throw notFound("That plan");
  const names = new Map(run.parts.map((p) => [p.id, p.name]));
  // A slab (true-shape plan) is one blank, "slab for N parts", its members in their own column.
  const partName = keyNamer(run.plan, names);
  const rows = run.plan.placements.map((p, i) => ({
    line: i + 1,
    block: p.block,
    part: partName(p.part),
    members: p.slab ? memberList(slabMembers(p), partName) : "",
    x_mm: r2(p.origin[0]),
    y_mm: r2(p.origin[1]),
    z_mm: r2(p.origin[2]),
    length_mm: r2(p.size[0]),
    width_mm: r2(p.size[1]),
    height_mm: r2(p.size[2]),
  }));
  return csvResponse(
    toCsv(rows, ["line", "block", "part", "x_mm", "y_mm", "z_mm", "length_mm", "width_mm", "height_mm", "members"]),
    `blockyard-plan-${run.id}-cut-list.csv`,
  );
});
