import "server-only";
import type { Knex } from "knex";
import { db } from "@/db";
import type { Plan } from "@/lib/nesting";
import { partIdFromKey, type PartForPlan } from "@/lib/planning/problem";
import type { Vec3 } from "@/lib/nesting";
import type { Profile } from "@/lib/profiles/part";

/** Parts of jobs with how many are still owed (ordered minus good parts already cut). */
export async function owedParts(
  trx: Knex | Knex.Transaction,
  jobIds: number[],
): Promise<(PartForPlan & { trueVolumeMm3: number | null; jobId: number })[]> {
  const rows = await trx("job_parts as p")
    .leftJoin("grades as g", "g.id", "p.grade_id")
    .whereIn("p.job_id", jobIds)
    .select(
      "p.id",
      "p.job_id",
      "p.name",
      "p.quantity",
      "p.size_x",
      "p.size_y",
      "p.size_z",
      "p.rotate",
      "p.true_volume_mm3",
      "p.profile",
      "g.code as grade_code",
      trx.raw("(SELECT coalesce(sum(c.good_count), 0) FROM cut_parts c WHERE c.job_part_id = p.id) AS done"),
    )
    .orderBy("p.id");
  return rows.map((r: Record<string, unknown>) => ({
    id: r.id as number,
    jobId: r.job_id as number,
    name: r.name as string,
    quantity: Math.max(0, (r.quantity as number) - Number(r.done)),
    size: [Number(r.size_x), Number(r.size_y), Number(r.size_z)] as Vec3,
    rotate: r.rotate as PartForPlan["rotate"],
    gradeCode: (r.grade_code as string | null) ?? null,
    trueVolumeMm3: r.true_volume_mm3 === null ? null : Number(r.true_volume_mm3),
    profile: (r.profile as Profile | null) ?? null,
  }));
}

/**
 * Parts this run still owes: what it could not place, plus rejects and parts a part-cut block did
 * not give (undone recordings cancel out). A caller that already holds the run's plan hands it in.
 */
export async function owedByRun(runId: number, knownPlan?: Plan | null): Promise<Map<number, number>> {
  const plan =
    knownPlan !== undefined
      ? knownPlan
      : ((await db()("nesting_runs").where({ id: runId }).first("plan"))?.plan as Plan | null | undefined);
  const owed = new Map<number, number>();
  for (const u of plan?.unplaced ?? [])
    owed.set(partIdFromKey(u.part), (owed.get(partIdFromKey(u.part)) ?? 0) + u.count);
  const rows = (await db()("cut_parts")
    .where({ run_id: runId })
    .groupBy("job_part_id")
    .select("job_part_id", db().raw("sum(rejected_count + not_cut_count)::int AS n"))) as {
    job_part_id: number;
    n: number;
  }[];
  for (const r of rows) if (Number(r.n) > 0) owed.set(r.job_part_id, (owed.get(r.job_part_id) ?? 0) + Number(r.n));
  return owed;
}

/** One part line of a job and how its cutting stands. */
export interface PartProgress {
  partId: number;
  name: string;
  gradeCode: string | null;
  /** Pieces ordered on the job. */
  ordered: number;
  /** Good pieces cut (undone recordings cancel out). */
  cut: number;
  /** Pieces cut and rejected at the machine (they are owed again). */
  rejected: number;
  /** Still to cut: ordered less good pieces, never below 0. */
  owed: number;
}

/**
 *   jobPartProgress(7)  // [{ partId, name, ordered: 12, cut: 9, rejected: 1, owed: 3 }, …] in the order added
 * From the recordings at the machine (cut_parts), so it agrees with what planning still owes.
 */
export async function jobPartProgress(jobId: number, k: Knex = db()): Promise<PartProgress[]> {
  const rows = (await k("job_parts as p")
    .leftJoin("grades as g", "g.id", "p.grade_id")
    .leftJoin(
      k("cut_parts")
        .groupBy("job_part_id")
        .select("job_part_id", k.raw("sum(good_count)::int AS good"), k.raw("sum(rejected_count)::int AS rejected"))
        .as("c"),
      "c.job_part_id",
      "p.id",
    )
    .where("p.job_id", jobId)
    .orderBy("p.id")
    .select(
      "p.id",
      "p.name",
      "p.quantity",
      "g.code as grade_code",
      k.raw("coalesce(c.good, 0) AS good"),
      k.raw("coalesce(c.rejected, 0) AS rejected"),
    )) as {
    id: number;
    name: string;
    quantity: number;
    grade_code: string | null;
    good: number | string;
    rejected: number | string;
  }[];
  return rows.map((r) => ({
    partId: r.id,
    name: r.name,
    gradeCode: r.grade_code,
    ordered: r.quantity,
    cut: Number(r.good),
    rejected: Number(r.rejected),
    owed: Math.max(0, r.quantity - Number(r.good)),
  }));
}
