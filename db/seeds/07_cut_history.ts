import type { Knex } from "knex";
import type { BlocksInsert, DefectZonesInsert, DefectZonesRow } from "../tables";
import { nestSync, parseProblem, type Plan, type Problem, type Vec3 } from "../../lib/nesting";
import { lossBreakdown } from "../../lib/planning/losses";
import { bestFigures, planFigures } from "../../lib/planning/plan-figures";
import { buildProblem, partIdFromKey, type PartForPlan, type StockForPlan } from "../../lib/planning/problem";
import { placedByPart } from "../../lib/planning/slabs";
import { clipZone, shareValue } from "../../lib/planning/recording";
import type { RunSettings } from "../../lib/validations/runs";

/**
 * Demo cut history for the manager's reports and the planner's worked examples (invented): the
 * blocks the stock seed marked cut, one finished job per calendar month of cutting, and for every
 * block a closed plan made by the nesting core here (the shop's settings, the long-bed cutter's
 * kerf for the grade, the block's defect zones) and recorded as the cutter would have: the block
 * consumed, the plan's offcuts in stock under the plan's codes (with the zones inside them), the
 * parts cut and rejected, and the losses by kind. Each plan gets a fixed iteration budget and seed,
 * so the same stock gives the same plans on every machine. Skipped when cut records already exist.
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

/** Improvement passes per plan: deterministic (no clock), and quick enough for a seed. */
const ITERATIONS = 12;
/** At most this share of a block's usable volume is asked of each part, and at most this many pieces. */
const FILL_PER_PART = 0.3;
const MAX_PER_PART = 24;
const DAY = 86400_000;

const CUSTOMERS = [
  "Larkspur Model Flyers",
  "Copperleaf Signs",
  "Meridian Stage Co.",
  "Brackwater Museum",
  "Fennick Architectural",
];
const PARTS: { name: string; size: Vec3; profiled: boolean }[] = [
  { name: "Wing core", size: [420, 230, 40], profiled: true },
  { name: "Letter blank", size: [600, 400, 100], profiled: true },
  { name: "Cornice run", size: [1200, 300, 250], profiled: true },
  { name: "Column drum", size: [500, 500, 450], profiled: false },
  { name: "Packing block", size: [600, 400, 300], profiled: false },
];

interface CutBlock {
  id: number;
  code: string;
  grade_id: number;
  grade_code: string;
  lot: string;
  delivery_id: number | null;
  size: Vec3;
  cost: number;
  volume_m3: number;
  moulded_on: string | null;
  cut_not_before: string;
  at: Date;
}

interface Zone {
  id: number;
  block_id: number;
  kind: DefectZonesRow["kind"];
  min: Vec3;
  max: Vec3;
  found_by: string | null;
  found_at: Date;
  note: string | null;
}

interface JobPart {
  id: number;
  name: string;
  size: Vec3;
  trueVolumeMm3: number | null;
}

/** A ledger movement as `appendLedger` writes it (the seed cannot use the server-only queries). */
function movement(
  blockId: number,
  kind: "reserved" | "consumed" | "offcut_created",
  volume: number,
  value: number,
  extra: { user: string; at: Date; reason: string; ref: string },
) {
  const sign = kind === "reserved" ? 0 : kind === "consumed" ? -1 : 1;
  return {
    block_id: blockId,
    kind,
    volume_m3: volume,
    delta_m3: sign * volume,
    value,
    delta_value: sign * value,
    user_id: extra.user,
    at: extra.at,
    reason: extra.reason,
    ref: extra.ref,
  };
}

/** The plan for one block: as many of each part as fit in about FILL_PER_PART of it, nested by the core. */
function planBlock(
  block: StockForPlan,
  parts: JobPart[],
  settings: RunSettings,
  seed: number,
): { problem: Problem; plan: Plan } {
  const usable = block.size.reduce((v, s) => v * Math.max(0, s - 2 * settings.trim), 1);
  const forPlan = (quantity: (p: JobPart) => number): PartForPlan[] =>
    parts.map((p) => ({ id: p.id, name: p.name, size: p.size, quantity: quantity(p), gradeCode: null, rotate: "any" }));
  const parse = (list: PartForPlan[]) => {
    const parsed = parseProblem(buildProblem(list, [block], settings));
    if (!parsed.ok) throw new Error(`cut history: ${block.code}: ${parsed.errors.join("; ")}`);
    return parsed.problem;
  };
  let problem = parse(
    forPlan((p) =>
      Math.max(1, Math.min(MAX_PER_PART, Math.floor((FILL_PER_PART * usable) / (p.size[0] * p.size[1] * p.size[2])))),
    ),
  );
  let plan = nestSync(problem, { seed, iterations: ITERATIONS });
  if (!plan.placements.length) throw new Error(`cut history: no part fits ${block.code}`);
  if (plan.unplaced.length) {
    // The planner asks for what fits in this block: the same layout, now complete, is where the core starts.
    const placed = placedByPart(plan.placements);
    problem = parse(forPlan((p) => placed.get(p.id) ?? 0));
    plan = nestSync(problem, { seed, iterations: ITERATIONS, warmStart: { ...plan, unplaced: [] } });
  }
  return { problem, plan };
}

export async function seed(knex: Knex): Promise<void> {
  if (await knex("plan_blocks").where({ status: "cut" }).first("id")) return;
  const r = rng(61206);
  const cut: CutBlock[] = (
    (await knex("blocks as b")
      .join("grades as g", "g.id", "b.grade_id")
      .whereNull("b.parent_id")
      .where("b.status", "cut")
      .orderBy([{ column: "b.updated_at" }, { column: "b.id" }])
      .select("b.*", "g.code as grade_code")) as Record<string, unknown>[]
  ).map((b) => ({
    id: b.id as number,
    code: b.code as string,
    grade_id: b.grade_id as number,
    grade_code: b.grade_code as string,
    lot: b.lot as string,
    delivery_id: b.delivery_id as number | null,
    size: [Number(b.size_x), Number(b.size_y), Number(b.size_z)],
    cost: Number(b.cost),
    volume_m3: Number(b.volume_m3),
    moulded_on: b.moulded_on as string | null,
    cut_not_before: b.cut_not_before as string,
    at: b.updated_at as Date,
  }));
  if (!cut.length) return;

  const shop = await knex("shop_settings").where({ id: 1 }).first();
  const base: RunSettings = {
    kerf: Number(shop?.kerf_mm ?? 1.5),
    trim: Number(shop?.trim_mm ?? 6),
    defectMargin: Number(shop?.defect_margin_mm ?? 10),
    minOffcut: [
      Number(shop?.min_offcut_x_mm ?? 150),
      Number(shop?.min_offcut_y_mm ?? 150),
      Number(shop?.min_offcut_z_mm ?? 25),
    ],
    layout: shop?.layout ?? "guillotine",
    timeLimitMs: shop?.nesting_time_limit_ms ?? 3000,
  };
  // Planned for the long-bed block cutter, with its kerf calibrated for the block's grade.
  const machine = await knex("machines").where({ kind: "block", active: true }).orderBy("id").first("id");
  const kerfOf = new Map<number, number>(
    machine
      ? (await knex("machine_grades").where({ machine_id: machine.id }).select("grade_id", "kerf_mm")).map((g) => [
          g.grade_id,
          g.kerf_mm,
        ])
      : [],
  );
  const zones = (
    await knex("defect_zones")
      .whereIn(
        "block_id",
        cut.map((b) => b.id),
      )
      .whereNull("removed_at")
      .orderBy("id")
  ).map(
    (z): Zone => ({
      id: z.id,
      block_id: z.block_id,
      kind: z.kind,
      min: [z.min_x, z.min_y, z.min_z],
      max: [z.max_x, z.max_y, z.max_z],
      found_by: z.found_by,
      found_at: z.found_at,
      note: z.note,
    }),
  );

  // One finished job per calendar month of cutting.
  const months = new Map<string, CutBlock[]>();
  for (const b of cut) {
    const m = b.at.toISOString().slice(0, 7);
    months.set(m, [...(months.get(m) ?? []), b]);
  }
  let n = 0;
  for (const [month, blocks] of months) {
    const customer = CUSTOMERS[n++ % CUSTOMERS.length]!;
    const first = blocks[0]!.at.getTime();
    const last = blocks.at(-1)!.at;
    const [job] = await knex("jobs")
      .insert({
        name: `${customer.split(" ")[0]} order ${month}`,
        customer,
        due_on: new Date(last.getTime() + 3 * DAY).toISOString().slice(0, 10),
        status: "done",
        created_by: "u-planner",
        created_at: new Date(first - 4 * DAY),
      })
      .returning("id");
    if (!job) throw new Error(`The job of ${month} was not saved.`);
    const chosen = [PARTS[n % PARTS.length]!, PARTS[(n + 2) % PARTS.length]!];
    // Any hot-wireable grade will do for these parts: the month's blocks are of several grades.
    const rows = await knex("job_parts")
      .insert(
        chosen.map((p) => ({
          job_id: job.id,
          name: p.name,
          quantity: 1, // set below to what was cut
          size_x: p.size[0],
          size_y: p.size[1],
          size_z: p.size[2],
          grade_id: null,
          rotate: "any",
          true_volume_mm3: p.profiled ? Math.round(p.size[0] * p.size[1] * p.size[2] * (0.62 + r() * 0.2)) : null,
        })),
      )
      .returning(["id", "name", "size_x", "size_y", "size_z", "true_volume_mm3"]);
    const parts: JobPart[] = rows.map((p) => ({
      id: p.id,
      name: p.name,
      size: [p.size_x, p.size_y, p.size_z],
      trueVolumeMm3: p.true_volume_mm3,
    }));
    const good = new Map<number, number>();

    for (const [k, b] of blocks.entries()) {
      const settings: RunSettings = { ...base, kerf: kerfOf.get(b.grade_id) ?? base.kerf };
      const own = zones.filter((z) => z.block_id === b.id);
      const stock: StockForPlan = {
        id: b.id,
        code: b.code,
        size: b.size,
        gradeCode: b.grade_code,
        cost: b.cost,
        isOffcut: false,
        defects: own.map((z) => ({ id: z.id, min: z.min, max: z.max })),
      };
      const { problem, plan } = planBlock(stock, parts, settings, b.id);
      const created = new Date(b.at.getTime() - 2 * DAY);
      const approved = new Date(b.at.getTime() - DAY);
      const [run] = await knex("nesting_runs")
        .insert({
          status: "closed",
          job_ids: [job.id],
          block_ids: [b.id],
          settings: JSON.stringify(settings),
          machine_id: machine?.id ?? null,
          problem: JSON.stringify(problem),
          plan: JSON.stringify(plan),
          summary: JSON.stringify(planFigures(problem, plan)),
          best: JSON.stringify(bestFigures(plan)),
          progress: 1,
          attempts: 1,
          created_by: "u-planner",
          created_at: created,
          started_at: created,
          finished_at: new Date(created.getTime() + 5_000),
          approved_by: "u-planner",
          approved_at: approved,
        })
        .returning("id");
      if (!run) throw new Error(`The plan of ${b.code} was not saved.`);
      const ref = `run:${run.id}`;

      // Approved: the block earmarked for the plan, the offcut codes fixed.
      const offcuts = plan.offcuts.filter((o) => o.block === b.code);
      const codes = offcuts.map((_, i) => `${b.code}.${i + 1}`);
      if (codes.length)
        await knex("plan_offcut_codes").insert(
          codes.map((code, i) => ({ run_id: run.id, block_id: b.id, offcut_index: i, code })),
        );
      const ledger = [
        movement(b.id, "reserved", b.volume_m3, b.cost, {
          user: "u-planner",
          at: approved,
          reason: `Plan #${run.id}`,
          ref,
        }),
        movement(b.id, "consumed", b.volume_m3, b.cost, {
          user: "u-cutter",
          at: b.at,
          reason: `Cut to plan #${run.id}`,
          ref,
        }),
      ];

      // Cut: every placed part came off; now and then one was rejected (never on a month's last block,
      // so the job ends with every part delivered).
      const placements = plan.placements.filter((p) => p.block === b.code);
      const placed = placedByPart(placements); // box plans: no slabs in the demo history
      const rejectPart = parts[0]!.id;
      const rejected = k < blocks.length - 1 && (placed.get(rejectPart) ?? 0) >= 2 && r() < 0.5 ? 1 : 0;
      const rejectedSizes = placements
        .filter((p) => partIdFromKey(p.part) === rejectPart)
        .slice(0, rejected)
        .map((p) => p.size);
      const losses = lossBreakdown({
        size: b.size,
        trim: settings.trim,
        kerf: settings.kerf,
        cuts: plan.cuts[b.code] ?? [],
        blanks: placements.map((p) => p.size),
        rejected: rejectedSizes,
        offcuts: offcuts.map((o) => ({ origin: o.origin, size: o.size })),
        defects: own.map((z) => ({
          min: z.min.map((v) => v - settings.defectMargin) as Vec3,
          max: z.max.map((v) => v + settings.defectMargin) as Vec3,
        })),
      });

      // The offcuts into stock under their codes, with a share of the block's value and the zones inside them.
      const values = shareValue(
        b.cost,
        losses.block,
        offcuts.map((o) => o.size),
      );
      const children = offcuts.length
        ? await knex("blocks")
            .insert(
              offcuts.map(
                (o, i): BlocksInsert => ({
                  code: codes[i]!,
                  grade_id: b.grade_id,
                  lot: b.lot,
                  delivery_id: b.delivery_id,
                  parent_id: b.id,
                  origin_in_parent: knex.raw("?::numeric[]", [`{${o.origin.join(",")}}`]),
                  nominal_x: o.size[0],
                  nominal_y: o.size[1],
                  nominal_z: o.size[2],
                  size_x: o.size[0],
                  size_y: o.size[1],
                  size_z: o.size[2],
                  cost: values[i]!,
                  location: "Bay C – offcut shelves",
                  moulded_on: b.moulded_on,
                  cut_not_before: b.cut_not_before,
                  status: "in_stock",
                  notes: `Offcut of ${b.code}, plan #${run.id}`,
                  created_at: b.at,
                  updated_at: b.at,
                }),
              ),
            )
            .returning(["id", "code", "volume_m3"])
        : [];
      const inherited: DefectZonesInsert[] = [];
      for (const [i, o] of offcuts.entries()) {
        const child = children.find((c) => c.code === codes[i])!;
        ledger.push(
          movement(child.id, "offcut_created", Number(child.volume_m3), values[i]!, {
            user: "u-cutter",
            at: b.at,
            reason: `Offcut of ${b.code}`,
            ref,
          }),
        );
        for (const z of own) {
          const clipped = clipZone(z, { origin: o.origin, size: o.size });
          if (clipped)
            inherited.push({
              block_id: child.id,
              kind: z.kind,
              min_x: clipped.min[0],
              min_y: clipped.min[1],
              min_z: clipped.min[2],
              max_x: clipped.max[0],
              max_y: clipped.max[1],
              max_z: clipped.max[2],
              found_by: z.found_by,
              found_at: z.found_at,
              note: z.note,
              inherited_from: z.id,
            });
        }
      }
      if (inherited.length) await knex("defect_zones").insert(inherited);
      await knex("stock_ledger").insert(ledger);

      // What was cut, part by part; yield counts the true volume where a profile exists.
      let partVolume = 0;
      const bases = new Set<string>();
      const cutRows = parts
        .filter((p) => placed.get(p.id))
        .map((p) => {
          const rej = p.id === rejectPart ? rejected : 0;
          const ok = placed.get(p.id)! - rej;
          good.set(p.id, (good.get(p.id) ?? 0) + ok);
          const basis = p.trueVolumeMm3 === null ? "box" : "profile";
          bases.add(basis);
          const each = (p.trueVolumeMm3 ?? p.size[0] * p.size[1] * p.size[2]) / 1e9;
          partVolume += each * ok;
          return {
            run_id: run.id,
            block_id: b.id,
            job_part_id: p.id,
            good_count: ok,
            rejected_count: rej,
            reject_reason: rej ? "Wire wander on the trailing edge" : null,
            part_volume_m3: each * ok,
            volume_basis: basis,
            recorded_by: "u-cutter",
            recorded_at: b.at,
          };
        });
      await knex("cut_parts").insert(cutRows);
      await knex("plan_blocks").insert({
        run_id: run.id,
        block_id: b.id,
        status: "cut",
        cut_at: b.at,
        cut_by: "u-cutter",
        block_volume_m3: losses.block,
        part_volume_m3: partVolume,
        offcut_volume_m3: losses.offcuts,
        loss_trim_m3: losses.trim,
        loss_kerf_m3: losses.kerf,
        loss_defect_m3: losses.defect,
        loss_unusable_m3: losses.unusable,
        loss_reject_m3: losses.rejects,
        volume_basis: bases.size > 1 ? "mixed" : ([...bases][0] ?? "box"),
      });
    }
    // The order was for what came off good: the job is done, nothing owed.
    for (const p of parts) {
      const q = good.get(p.id) ?? 0;
      if (q > 0) await knex("job_parts").where({ id: p.id }).update({ quantity: q });
      else if (!(await knex("cut_parts").where({ job_part_id: p.id }).first("id")))
        await knex("job_parts").where({ id: p.id }).delete();
    }
  }
}
