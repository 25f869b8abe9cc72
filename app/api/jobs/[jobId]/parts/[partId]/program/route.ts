import { api, parseWith } from "@/lib/auth/guard";
import { partProgram } from "@/db/queries/profile-programs";
import { idParam } from "@/lib/params";
import { programQuerySchema } from "@/lib/validations/profile-programs";

type P = { jobId: string; partId: string };

/**
 * One part's profile program on a profile cutter (`machineId`, else the shop's first), as G-code
 * (`format=gcode`, a download) or its drawing to scale (`format=svg`). Choices: `direction=cw|ccw`,
 * `dwell` seconds at corners turning at least `dwellAngle` degrees, `leadIn=x,y` and
 * `slits=x,y;x,y` (mm in the part's frame), `zRoot` (4-axis: first tower to the root face).
 * 409 when the part has no profile or the machine cannot cut it, naming the limit.
 */
export const GET = api<P>("GET /api/jobs/[jobId]/parts/[partId]/program", async ({ req, params }) => {
  const jobId = idParam(params.jobId, "That job");
  const partId = idParam(params.partId, "That part");
  const q = parseWith(programQuerySchema, Object.fromEntries(req.nextUrl.searchParams));
  const { program, name } = await partProgram(jobId, partId, q.machineId ?? null, {
    direction: q.direction,
    dwell: q.dwell ? { seconds: q.dwell, angleDeg: q.dwellAngle } : null,
    leadIn: q.leadIn ?? null,
    slits: q.slits,
    zRoot: q.zRoot ?? null,
  });
  if (q.format === "svg")
    return new Response(program.svg, {
      headers: {
        "content-type": "image/svg+xml; charset=utf-8",
        "content-disposition": `inline; filename="${name}.svg"`,
      },
    });
  return new Response(program.gcode, {
    headers: {
      "content-type": "text/plain; charset=utf-8",
      "content-disposition": `attachment; filename="${name}.nc"`,
    },
  });
});
