import "server-only";
import { db } from "@/db";
import { isoDate } from "@/lib/stock";

export interface JobDue {
  id: number;
  name: string;
  dueOn: string | null;
  status: string;
  owed: number;
}

/** The planner's morning: open jobs by due date with parts still owed, and ready stock by grade. */
export async function plannerFigures(today = isoDate()) {
  const jobs = (await db()("jobs as j")
    .whereIn("j.status", ["open", "planned", "cutting"])
    .select(
      "j.id",
      "j.name",
      "j.due_on",
      "j.status",
      db().raw(
        `(SELECT coalesce(sum(greatest(p.quantity - coalesce((SELECT sum(c.good_count) FROM cut_parts c WHERE c.job_part_id = p.id), 0), 0)), 0) FROM job_parts p WHERE p.job_id = j.id) AS owed`,
      ),
    )
    .orderByRaw("j.due_on NULLS LAST, j.id")
    .limit(8)) as { id: number; name: string; due_on: Date | null; status: string; owed: string }[];
  const ready = (await db()("blocks as b")
    .join("grades as g", "g.id", "b.grade_id")
    .where("b.status", "in_stock")
    .where("b.cut_not_before", "<=", today)
    .groupBy("g.code", "g.colour")
    .select("g.code", "g.colour", db().raw("count(*) AS n"), db().raw("sum(b.volume_m3) AS m3"))
    .orderBy("g.code")) as { code: string; colour: string; n: string; m3: string }[];
  return {
    jobs: jobs.map(
      (j): JobDue => ({
        id: j.id,
        name: j.name,
        dueOn: j.due_on ? isoDate(j.due_on) : null,
        status: j.status,
        owed: Number(j.owed),
      }),
    ),
    ready: ready.map((r) => ({ grade: r.code, colour: r.colour, pieces: Number(r.n), m3: Number(r.m3) })),
  };
}

/** The cutter's day: approved plans with blocks still to cut. */
export async function cutterFigures() {
  const rows = (await db()("nesting_runs as r")
    .join("plan_blocks as pb", "pb.run_id", "r.id")
    .where("r.status", "approved")
    .groupBy("r.id")
    .select(
      "r.id",
      "r.job_ids",
      "r.approved_at",
      db().raw("count(*) FILTER (WHERE pb.status = 'reserved') AS to_cut"),
      db().raw("count(*) FILTER (WHERE pb.status = 'cut') AS cut"),
    )
    .orderBy("r.approved_at")) as { id: number; job_ids: number[]; to_cut: string; cut: string }[];
  const names = new Map<number, string>(
    (
      await db()("jobs")
        .whereIn("id", [...new Set(rows.flatMap((r) => r.job_ids))])
        .select("id", "name")
    ).map((j: { id: number; name: string }) => [j.id, j.name]),
  );
  return rows.map((r) => ({
    id: r.id,
    jobs: r.job_ids.map((id) => names.get(id) ?? `#${id}`),
    toCut: Number(r.to_cut),
    cut: Number(r.cut),
  }));
}
