import type { Knex } from "knex";

/**
 * Demo cut history for the manager's reports (invented): for every block the stock seed cut up,
 * a finished job, a closed nesting run and the plan-block and cut-part records the cutter would
 * have left — part volume (true volume for profiled parts, bounding box otherwise), usable offcuts
 * (the offcuts the stock seed kept) and losses by kind. Skipped when cut records already exist.
 */
function rng(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = Math.imul(a ^ (a >>> 15), a | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const CUSTOMERS = [
  "Larkspur Model Flyers",
  "Copperleaf Signs",
  "Meridian Stage Co.",
  "Brackwater Museum",
  "Fennick Architectural",
];
const PARTS: { name: string; size: [number, number, number]; profiled: boolean }[] = [
  { name: "Wing core", size: [420, 230, 40], profiled: true },
  { name: "Letter blank", size: [600, 400, 100], profiled: true },
  { name: "Cornice run", size: [1200, 300, 250], profiled: true },
  { name: "Column drum", size: [500, 500, 450], profiled: false },
  { name: "Packing block", size: [600, 400, 300], profiled: false },
];

export async function seed(knex: Knex): Promise<void> {
  if (await knex("plan_blocks").where({ status: "cut" }).first("id")) return;
  const r = rng(61206);
  const cut = (await knex("blocks as b")
    .join("stock_ledger as l", function () {
      this.on("l.block_id", "b.id").andOnVal("l.kind", "=", "consumed");
    })
    .whereNull("b.parent_id")
    .where("b.status", "cut")
    .orderBy("l.at")
    .select(
      "b.id",
      "b.grade_id",
      "b.volume_m3",
      "l.at",
      knex.raw("(SELECT coalesce(sum(c.volume_m3), 0) FROM blocks c WHERE c.parent_id = b.id) AS offcut"),
      knex.raw("(SELECT count(*) FROM defect_zones z WHERE z.block_id = b.id) AS defects"),
    )) as {
    id: number;
    grade_id: number;
    volume_m3: string;
    at: Date;
    offcut: string;
    defects: string;
  }[];
  if (!cut.length) return;

  // One finished job per calendar month of cutting.
  const months = new Map<string, typeof cut>();
  for (const b of cut) {
    const m = b.at.toISOString().slice(0, 7);
    months.set(m, [...(months.get(m) ?? []), b]);
  }
  let n = 0;
  for (const [month, blocks] of months) {
    const customer = CUSTOMERS[n++ % CUSTOMERS.length]!;
    const [job] = await knex("jobs")
      .insert({
        name: `${customer.split(" ")[0]} order ${month}`,
        customer,
        due_on: `${month}-28`,
        status: "done",
        created_by: "u-planner",
        created_at: blocks[0]!.at,
      })
      .returning("id");
    const chosen = [PARTS[n % PARTS.length]!, PARTS[(n + 2) % PARTS.length]!];
    const parts = await knex("job_parts")
      .insert(
        chosen.map((p) => ({
          job_id: job.id,
          name: p.name,
          quantity: 40,
          size_x: p.size[0],
          size_y: p.size[1],
          size_z: p.size[2],
          grade_id: blocks[0]!.grade_id,
          true_volume_mm3: p.profiled ? Math.round(p.size[0] * p.size[1] * p.size[2] * (0.62 + r() * 0.2)) : null,
        })),
      )
      .returning(["id", "true_volume_mm3", "size_x", "size_y", "size_z"]);
    for (const b of blocks) {
      const block = Number(b.volume_m3);
      const offcut = Number(b.offcut);
      const trim = block * (0.025 + r() * 0.015);
      const kerf = block * (0.008 + r() * 0.01);
      const defect = Number(b.defects) > 0 ? block * (0.01 + r() * 0.03) : 0;
      const reject = block * r() * 0.015;
      const part = Math.max(0, (block - offcut) * (0.58 + r() * 0.2));
      const unusable = Math.max(0, block - offcut - part - trim - kerf - defect - reject);
      const bases = parts.map((p: { true_volume_mm3: string | null }) =>
        p.true_volume_mm3 === null ? "box" : "profile",
      );
      const [run] = await knex("nesting_runs")
        .insert({
          status: "closed",
          job_ids: [job.id],
          block_ids: [b.id],
          settings: JSON.stringify({ seeded: true }),
          problem: JSON.stringify({ seeded: true }),
          progress: 1,
          created_by: "u-planner",
          created_at: new Date(b.at.getTime() - 2 * 86400_000),
          finished_at: new Date(b.at.getTime() - 2 * 86400_000),
          approved_by: "u-planner",
          approved_at: new Date(b.at.getTime() - 86400_000),
        })
        .returning("id");
      await knex("plan_blocks").insert({
        run_id: run.id,
        block_id: b.id,
        status: "cut",
        cut_at: b.at,
        cut_by: "u-cutter",
        block_volume_m3: block,
        part_volume_m3: part,
        offcut_volume_m3: offcut,
        loss_trim_m3: trim,
        loss_kerf_m3: kerf,
        loss_defect_m3: defect,
        loss_unusable_m3: unusable,
        loss_reject_m3: reject,
        volume_basis: new Set(bases).size > 1 ? "mixed" : bases[0],
      });
      const share = 0.4 + r() * 0.3;
      await knex("cut_parts").insert(
        parts.map(
          (
            p: { id: number; true_volume_mm3: string | null; size_x: string; size_y: string; size_z: string },
            i: number,
          ) => {
            const each =
              (p.true_volume_mm3 === null
                ? Number(p.size_x) * Number(p.size_y) * Number(p.size_z)
                : Number(p.true_volume_mm3)) / 1e9;
            const v = part * (i === 0 ? share : 1 - share);
            return {
              run_id: run.id,
              block_id: b.id,
              job_part_id: p.id,
              good_count: Math.max(1, Math.round(v / each)),
              rejected_count: reject > 0.01 && i === 0 ? 1 : 0,
              reject_reason: reject > 0.01 && i === 0 ? "Wire wander on the trailing edge" : null,
              part_volume_m3: v,
              volume_basis: p.true_volume_mm3 === null ? "box" : "profile",
              recorded_by: "u-cutter",
              recorded_at: b.at,
            };
          },
        ),
      );
    }
  }
}
