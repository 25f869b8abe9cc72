import { api, parseWith } from "@/lib/auth/guard";
import { runProfilePrograms } from "@/db/queries/profile-programs";
import { HttpError } from "@/lib/errors";
import { idParam } from "@/lib/params";
import { programQuerySchema } from "@/lib/validations/profile-programs";

type P = { runId: string };

/**
 * The profile programs of a plan, one per slab (the profile parts of one block with the same
 * extent along the wire), on a profile cutter (`machineId`, else the shop's first). Without
 * `slab`: the list of slabs, each with its parts, length, time and the limit when the machine
 * cannot cut it. With `slab=HF-1001 slab 1`: that slab's G-code (`format=gcode`) or drawing
 * (`format=svg`). `direction` and `dwell` / `dwellAngle` as for one part.
 */
export const GET = api<P>("GET /api/runs/[runId]/profile-programs", async ({ req, params }) => {
  const runId = idParam(params.runId, "That plan");
  const q = parseWith(programQuerySchema, Object.fromEntries(req.nextUrl.searchParams));
  const { machine, slabs } = await runProfilePrograms(runId, q.machineId ?? null, {
    direction: q.direction,
    dwell: q.dwell ? { seconds: q.dwell, angleDeg: q.dwellAngle } : null,
  });
  if (!q.slab)
    return {
      machine: { id: machine.id, name: machine.name, fourAxis: !!machine.fourAxis },
      slabs: slabs.map((s) => ({
        slab: s.label,
        block: s.slab.block,
        parts: s.names,
        alongWire: s.slab.along,
        size: s.slab.size,
        lengthMm: s.program ? Math.round(s.program.feedMm) : null,
        minutes: s.program ? Math.round(s.program.minutes.total * 10) / 10 : null,
        warnings: s.program?.warnings ?? [],
        problem: s.problem,
      })),
    };
  const s = slabs.find((x) => x.label.toLowerCase() === q.slab!.trim().toLowerCase());
  if (!s)
    throw new HttpError(
      404,
      `This plan has no slab “${q.slab}”; its slabs are ${slabs.map((x) => x.label).join(", ")}.`,
    );
  if (!s.program) throw new HttpError(409, `${machine.name} cannot cut ${s.label}: ${s.problem}`);
  const name = `plan-${runId}-${s.label.replace(/[^\w.-]+/g, "-")}`;
  if (q.format === "svg")
    return new Response(s.program.svg, {
      headers: {
        "content-type": "image/svg+xml; charset=utf-8",
        "content-disposition": `inline; filename="${name}.svg"`,
      },
    });
  return new Response(s.program.gcode, {
    headers: {
      "content-type": "text/plain; charset=utf-8",
      "content-disposition": `attachment; filename="${name}.nc"`,
    },
  });
});
