import type { Knex } from "knex";

/**
 * The demo shop's cutters (invented figures for an invented shop): a long-bed block cutter with a
 * horizontal wire and a turntable, and a smaller 4-axis profile cutter. Kerf and feed calibrated
 * per grade on the block cutter; the other grades take the shop's defaults.
 */
export async function seed(knex: Knex): Promise<void> {
  await knex.raw("TRUNCATE plan_block_steps, plan_offcut_codes, machine_grades, machines RESTART IDENTITY CASCADE");
  const [block] = await knex("machines")
    .insert({
      name: "Bay 1 long bed",
      kind: "block",
      wire: "horizontal",
      wire_length_mm: 1350,
      travel_x_mm: 5200,
      travel_y_mm: 1300,
      max_length_mm: 5000,
      max_width_mm: 1300,
      max_height_mm: 1250,
      turntable: true,
      rapid_mm_per_min: 2400,
      heat_up_s: 20,
      handling_s: 90,
      unit_words: "G20/G21",
      inch: false,
      heat_on: "M3",
      heat_off: "M5",
      axis_x: "X",
      axis_y: "Y",
      line_numbers: false,
    })
    .returning("id");
  await knex("machines").insert({
    name: "Bay 2 profile cutter",
    kind: "profile",
    wire: "horizontal",
    wire_length_mm: 1000,
    travel_x_mm: 1250,
    travel_y_mm: 650,
    max_length_mm: 1200,
    max_width_mm: 1000,
    max_height_mm: 600,
    turntable: false,
    rapid_mm_per_min: 1500,
    heat_up_s: 10,
    handling_s: 60,
    unit_words: "G70/G71",
    inch: false,
    heat_on: "M64 P0",
    heat_off: "M65 P0",
    axis_x: "X",
    axis_y: "Y",
    line_numbers: true,
    four_axis: true,
    axis_u: "U",
    axis_v: "V",
  });
  const grades = (await knex("grades").select("id", "code")) as { id: number; code: string }[];
  const calibrated: Record<string, [number, number]> = {
    "EPS-I": [1.6, 320],
    "EPS-VIII": [1.5, 300],
    "EPS-II": [1.4, 260],
    "EPS-IX": [1.3, 220],
    "XPS-IV": [1.2, 180],
  };
  const rows = grades
    .filter((g) => calibrated[g.code])
    .map((g) => ({
      machine_id: block!.id,
      grade_id: g.id,
      kerf_mm: calibrated[g.code]![0],
      feed_mm_per_min: calibrated[g.code]![1],
    }));
  if (rows.length) await knex("machine_grades").insert(rows);
}
