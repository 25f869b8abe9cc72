import "server-only";
import type { Knex } from "knex";
import { db } from "@/db";
import { owedParts } from "./owed";
import { whereCodeMatches } from "./blocks";
import { getMachine, kerfAndFeed, listMachines } from "./machines";
import { getShopSettings } from "./settings";
import { HttpError } from "@/lib/errors";
import { isoDate } from "@/lib/stock";
import { parseProblem } from "@/lib/nesting";
import { MAX_PIECES } from "@/lib/nesting/parse";
import { buildProblem, partIdFromKey, partKey, type StockForPlan } from "@/lib/planning/problem";
import type { RunSettings } from "@/lib/validations/runs";
import { leftOutLine, whyUnusable, type LeftOut } from "@/lib/planning/usable";
import { slabMaxFor } from "@/lib/planning/machine";
import type { Vec3 } from "@/lib/nesting";

/** Planning a nesting run: the stock it may use, the parts still owed, and the queued run itself. */

/**
 * Parts that approved plans already hold: placed in blocks they have reserved and not yet cut,
 * per job part (and which plans), optionally leaving one plan out.
 */
export async function heldByApprovedPlans(
  trx: Knex | Knex.Transaction,
  partIds: number[],
  exceptRunId?: number,
): Promise<Map<number, { count: number; runs: number[] }>> {
  const held = new Map<number, { count: number; runs: number[] }>();
  if (!partIds.length) return held;
  // A slab placement (true-shape plan, `pl.slab`) holds its members: one row per member.
  const { rows } = await trx.raw(
    `SELECT pc.part, r.id AS run_id, count(*)::int AS n
       FROM plan_blocks pb
       JOIN nesting_runs r ON r.id = pb.run_id
       JOIN blocks b ON b.id = pb.block_id
       CROSS JOIN LATERAL jsonb_array_elements(r.plan->'placements') AS pl
       CROSS JOIN LATERAL (
         SELECT m->>'part' AS part FROM jsonb_array_elements(pl->'slab'->'members') AS m WHERE pl->'slab' IS NOT NULL
         UNION ALL
         SELECT pl->>'part' WHERE pl->'slab' IS NULL
       ) AS pc
      WHERE pb.status = 'reserved' AND r.status = 'approved' AND r.id <> ? AND pl->>'block' = b.code AND pc.part = ANY(?)
      GROUP BY 1, 2
      ORDER BY 2`,
    [exceptRunId ?? -1, partIds.map(partKey)],
  );
  for (const r of rows as { part: string; run_id: number; n: number }[]) {
    const id = partIdFromKey(r.part);
    const h = held.get(id) ?? { count: 0, runs: [] };
    h.count += r.n;
    h.runs.push(r.run_id);
    held.set(id, h);
  }
  return held;
}

/** "plan #3" or "plans #3, #5", for messages. */
export const plansNamed = (runs: number[]): string =>
  `${runs.length === 1 ? "plan" : "plans"} ${runs.map((r) => `#${r}`).join(", ")}`;

async function stockForPlan(
  trx: Knex | Knex.Transaction,
  blockIds: number[],
): Promise<(StockForPlan & { status: string; cutNotBefore: string; neverHotWire: boolean })[]> {
  const rows = await trx("blocks as b")
    .join("grades as g", "g.id", "b.grade_id")
    .whereIn("b.id", blockIds)
    .select("b.*", "g.code as grade_code", "g.never_hot_wire")
    .orderBy("b.id");
  const defects = await trx("defect_zones").whereIn("block_id", blockIds).whereNull("removed_at").orderBy("id");
  return rows.map((r: Record<string, unknown>) => ({
    id: r.id as number,
    code: r.code as string,
    size: [Number(r.size_x), Number(r.size_y), Number(r.size_z)] as Vec3,
    gradeCode: r.grade_code as string,
    cost: Number(r.cost),
    isOffcut: r.parent_id !== null,
    status: r.status as string,
    neverHotWire: Boolean(r.never_hot_wire),
    cutNotBefore: r.cut_not_before as string, // DATE: its 'YYYY-MM-DD' text (db/types.ts)
    defects: defects
      .filter((d: { block_id: number }) => d.block_id === r.id)
      .map((d) => ({
        id: d.id,
        min: [d.min_x, d.min_y, d.min_z] as Vec3,
        max: [d.max_x, d.max_y, d.max_z] as Vec3,
      })),
  }));
}

export interface Candidate {
  id: number;
  code: string;
  gradeCode: string;
  size: Vec3;
  volumeM3: number;
  cost: number;
  isOffcut: boolean;
  location: string;
  defectCount: number;
  since: string;
}

/** Ready blocks a new plan is offered at most, oldest first (the form says when there are more). */
export const CANDIDATE_LIMIT = 500;

/**
 * Stock a run may use for these jobs: ready (cut-not-before passed), in stock, of the grades the
 * parts need (any hot-wireable grade for parts without one), never a no-hot-wire grade; oldest first.
 * Only blocks that can hold some part still owed (after the face trim, in a way the part may be
 * turned) are offered; the others are listed in `leftOut`, each with the reason. At most
 * CANDIDATE_LIMIT are read (`capped` says when there were more); `code` finds blocks by their code.
 */
export async function candidateStock(
  jobIds: number[],
  opts: { today?: string; trim?: number; code?: string } = {},
): Promise<{ items: Candidate[]; leftOut: LeftOut[]; capped: boolean }> {
  const today = opts.today ?? isoDate();
  const [owed, trim] = await Promise.all([owedParts(db(), jobIds), opts.trim ?? getShopSettings().then((s) => s.trim)]);
  const grades = await db()("job_parts").whereIn("job_id", jobIds).distinct("grade_id").pluck("grade_id");
  const anyGrade = grades.includes(null);
  const q = db()("blocks as b")
    .join("grades as g", "g.id", "b.grade_id")
    .where("b.status", "in_stock")
    .where("b.cut_not_before", "<=", today)
    .where("g.never_hot_wire", false)
    .select(
      "b.id",
      "b.code",
      "b.size_x",
      "b.size_y",
      "b.size_z",
      "b.volume_m3",
      "b.cost",
      "b.parent_id",
      "b.location",
      "g.code as grade_code",
      db().raw("coalesce(b.moulded_on, b.created_at::date) AS since"),
      db().raw(
        "(SELECT count(*) FROM defect_zones z WHERE z.block_id = b.id AND z.removed_at IS NULL) AS defect_count",
      ),
    )
    .orderByRaw("coalesce(b.moulded_on, b.created_at::date), b.id")
    .limit(CANDIDATE_LIMIT + 1);
  // Found by code (the form's search, for stock past the oldest offered).
  if (opts.code) whereCodeMatches(q, opts.code);
  if (!anyGrade)
    q.whereIn(
      "b.grade_id",
      grades.filter((g): g is number => g !== null),
    );
  const found = await q;
  // One row more than offered says whether there are more.
  const capped = found.length > CANDIDATE_LIMIT;
  const rows = found.slice(0, CANDIDATE_LIMIT);
  const all: Candidate[] = rows.map((r: Record<string, unknown>) => ({
    id: r.id as number,
    code: r.code as string,
    gradeCode: r.grade_code as string,
    size: [Number(r.size_x), Number(r.size_y), Number(r.size_z)] as Vec3,
    volumeM3: Number(r.volume_m3),
    cost: Number(r.cost),
    isOffcut: r.parent_id !== null,
    location: r.location as string,
    defectCount: Number(r.defect_count),
    since: r.since as string, // a DATE: its 'YYYY-MM-DD' text
  }));
  const items: Candidate[] = [];
  const leftOut: LeftOut[] = [];
  for (const c of all) {
    const reason = whyUnusable(c, owed, trim);
    if (reason) leftOut.push({ id: c.id, code: c.code, reason });
    else items.push(c);
  }
  return { items, leftOut, capped };
}

/**
 * Creates a queued run for the jobs' owed parts (or the given part quantities) in the chosen stock.
 * One block never stops a run: blocks that cannot be used (not free, settling, no-hot-wire, too
 * small for any part after trim, or refused by the problem's checks) are left out with the reason,
 * kept with the run and returned; only when nothing usable is left is the run refused.
 */
export async function createRun(
  input: {
    jobIds: number[];
    blockIds: number[];
    settings: RunSettings;
    quantities?: Map<number, number>;
    parentRunId?: number;
    machineId?: number | null;
  },
  actorId: string,
): Promise<{ id: number; leftOut: LeftOut[] }> {
  return db().transaction(async (trx) => {
    const jobs = await trx("jobs").whereIn("id", input.jobIds).select("id", "status");
    if (jobs.length !== new Set(input.jobIds).size)
      throw new HttpError(400, "Some fields need attention.", { jobIds: "One of those jobs does not exist." });
    let parts = await owedParts(trx, input.jobIds);
    let heldRuns: number[] = [];
    if (input.quantities) parts = parts.map((p) => ({ ...p, quantity: input.quantities!.get(p.id) ?? 0 }));
    else {
      // Parts an approved plan already holds in reserved blocks are on their way: not planned twice.
      const held = await heldByApprovedPlans(
        trx,
        parts.map((p) => p.id),
      );
      heldRuns = [...new Set([...held.values()].flatMap((h) => h.runs))];
      parts = parts.map((p) => ({ ...p, quantity: Math.max(0, p.quantity - (held.get(p.id)?.count ?? 0)) }));
    }
    parts = parts.filter((p) => p.quantity > 0);
    const pieces = parts.reduce((n, p) => n + p.quantity, 0);
    if (pieces > MAX_PIECES)
      throw new HttpError(
        400,
        `These jobs owe ${pieces.toLocaleString("en")} pieces; one plan nests at most ${MAX_PIECES.toLocaleString("en")}. Plan fewer jobs at a time, or split the part list into smaller jobs.`,
        { jobIds: `At most ${MAX_PIECES.toLocaleString("en")} pieces in one plan.` },
      );
    if (!parts.length)
      throw new HttpError(
        409,
        heldRuns.length
          ? `Nothing is left to plan: every part still owed is in approved ${plansNamed(heldRuns)}, waiting to be cut. Release a plan first to plan those parts again.`
          : (await trx("job_parts").whereIn("job_id", input.jobIds).first("id"))
            ? "Nothing is owed on these jobs: every part has been cut."
            : `${input.jobIds.length === 1 ? "This job has" : "These jobs have"} no parts yet: add the parts to cut on the job's page, then plan it.`,
      );
    const chosen = await stockForPlan(trx, input.blockIds);
    if (chosen.length !== new Set(input.blockIds).size)
      throw new HttpError(400, "Some fields need attention.", { blockIds: "Some of that stock does not exist." });
    const today = isoDate();
    const leftOut: LeftOut[] = [];
    const leave = (b: { id: number; code: string }, reason: string) => leftOut.push({ id: b.id, code: b.code, reason });
    let stock = chosen.filter((b) => {
      const reason = b.neverHotWire
        ? "a no-hot-wire grade (polyurethane): it cannot go into a hot-wire plan"
        : b.status !== "in_stock"
          ? `not free (${b.status === "earmarked" ? "earmarked for another plan" : b.status === "on_hold" ? "on hold until the buyer releases it" : "no longer in stock"})`
          : b.cutNotBefore > today
            ? `still settling until ${b.cutNotBefore}`
            : whyUnusable(b, parts, input.settings.trim);
      if (reason) leave(b, reason);
      return !reason;
    });
    const refuseAll = () => {
      const lines = leftOut.map(leftOutLine);
      const shown = lines.slice(0, 5).join("; ") + (lines.length > 5 ? `; and ${lines.length - 5} more` : "");
      return new HttpError(409, `None of the chosen stock can be used for these parts: ${shown}.`, {
        blockIds: `${lines[0] ?? "No stock chosen"}.`,
      });
    };
    if (!stock.length) throw refuseAll();
    // Made for one block cutter: its calibrated kerf for the grades involved (the widest of them).
    let settings = input.settings;
    if (input.machineId) {
      const machine = await getMachine(input.machineId, trx);
      if (!machine) throw new HttpError(400, "Some fields need attention.", { machineId: "No such machine." });
      if (machine.kind !== "block" || !machine.active)
        throw new HttpError(400, "Some fields need attention.", {
          machineId: `${machine.name} is ${machine.active ? "a profile cutter" : "retired"}: choose a block cutter.`,
        });
      const gradeCodes = [...new Set(stock.map((b) => b.gradeCode).filter((c): c is string => !!c))];
      const gradeIds = gradeCodes.length
        ? ((await trx("grades").whereIn("code", gradeCodes).select("id")) as { id: number }[]).map((g) => g.id)
        : [];
      const { kerf } = kerfAndFeed(machine, gradeIds, { kerf: input.settings.kerf, feed: 0 });
      settings = { ...input.settings, kerf };
    }
    // True-shape slabs are sized for the profile cutter their programs are made for (the shop's
    // first active one, as on the plan page); without one, by the blocks alone.
    const profileCutter = settings.trueShape
      ? (await listMachines({ activeOnly: true }, trx)).find((m) => m.kind === "profile")
      : undefined;
    const slabMax = profileCutter ? slabMaxFor(profileCutter) : null;
    let parsed = parseProblem(buildProblem(parts, stock, settings, { slabMax }));
    // A block the problem's checks refuse (its record disagrees with itself, such as a zone left
    // outside it by a re-measure) is left out with the check's words, not the whole run refused.
    for (let round = 0; !parsed.ok && round < 2; round++) {
      const bad = new Map<number, string>();
      for (const e of parsed.errors) {
        const m = /^blocks\[(\d+)\][^:]*: (.*)$/.exec(e);
        const i = m ? Number(m[1]) : -1;
        if (m && stock[i] && !bad.has(i)) bad.set(i, `its record cannot be planned: ${m[2]}`);
      }
      if (!bad.size) break;
      for (const [i, reason] of bad) leave(stock[i]!, reason);
      stock = stock.filter((_, i) => !bad.has(i));
      if (!stock.length) throw refuseAll();
      parsed = parseProblem(buildProblem(parts, stock, settings, { slabMax }));
    }
    if (!parsed.ok)
      throw new HttpError(400, `The nesting problem is not valid: ${parsed.errors.slice(0, 3).join("; ")}`);
    const [run] = await trx("nesting_runs")
      .insert({
        status: "queued",
        job_ids: input.jobIds,
        block_ids: stock.map((b) => b.id),
        settings,
        machine_id: input.machineId ?? null,
        problem: JSON.stringify(parsed.problem),
        parent_run_id: input.parentRunId ?? null,
        created_by: actorId,
        left_out: JSON.stringify(leftOut),
      })
      .returning("id");
    if (!run) throw new Error("The run was not saved.");
    await trx("audit_log").insert({
      actor_id: actorId,
      action: "run.create",
      subject: `run:${run.id}`,
      detail: { jobIds: input.jobIds, blocks: stock.length, leftOut },
    });
    return { id: run.id, leftOut };
  });
}
