import type { Knex } from "knex";
import type { StockLedgerInsert } from "../tables";
import type { Vec3 } from "../../lib/nesting";

/**
 * Demo stock for Hollowfield Foamworks (invented): grades, three invented suppliers, about 60
 * blocks across several bays, some still settling, some with defect zones, and three months of
 * ledger history. Deterministic: the same seed gives the same shop. The blocks marked cut are cut
 * by 07_cut_history (their plans, offcuts and ledger rows); `updated_at` holds the day they were cut.
 */

// Small deterministic PRNG (mulberry32) so the demo is the same on every machine.
function rng(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const day = (offset: number) => {
  const d = new Date();
  d.setHours(12, 0, 0, 0);
  d.setDate(d.getDate() + offset);
  return d;
};
const iso = (d: Date) =>
  `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, "0")}-${String(d.getDate()).padStart(2, "0")}`;

// Minimum densities: ASTM C578 table (see ../shared/domain-brief.md §1). The shop's own codes.
export const GRADES = [
  {
    code: "EPS-I",
    material: "EPS",
    grade_system: "ASTM C578",
    grade: "Type I",
    nominal: 15.5,
    min: 14.4,
    cure: 14,
    colour: "#9fc3c8",
    unit: "bf",
  },
  {
    code: "EPS-VIII",
    material: "EPS",
    grade_system: "ASTM C578",
    grade: "Type VIII",
    nominal: 19.5,
    min: 18.4,
    cure: 14,
    colour: "#6fa8b0",
    unit: "bf",
  },
  {
    code: "EPS-II",
    material: "EPS",
    grade_system: "ASTM C578",
    grade: "Type II",
    nominal: 23,
    min: 21.6,
    cure: 14,
    colour: "#3f8791",
    unit: "bf",
  },
  {
    code: "EPS-IX",
    material: "EPS",
    grade_system: "ASTM C578",
    grade: "Type IX",
    nominal: 30,
    min: 28.8,
    cure: 21,
    colour: "#1f5f68",
    unit: "bf",
  },
  {
    code: "XPS-IV",
    material: "XPS",
    grade_system: "ASTM C578",
    grade: "Type IV",
    nominal: 26,
    min: 24.8,
    cure: 0,
    colour: "#c9a5d6",
    unit: "m3",
  },
  {
    code: "PU-SIGN-15",
    material: "PU",
    grade_system: "shop",
    grade: "Sign foam 15 lb",
    nominal: 240,
    min: null,
    cure: 0,
    colour: "#d8b26e",
    unit: "m3",
  },
] as const;

const SUPPLIERS = [
  {
    name: "Ashcombe Bead & Block",
    contact: "Marta Ilves",
    email: "orders@ashcombe-bead.test",
    phone: "+1 555 0142",
    lead_time_days: 12, // working days
    lead_time_sd_days: 1.5,
  },
  {
    name: "Northgate Moulders",
    contact: "Femi Adeyemi",
    email: "sales@northgate-moulders.test",
    phone: "+1 555 0178",
    lead_time_days: 18, // working days
    lead_time_sd_days: 3,
  },
  {
    name: "Tallow Creek Foams",
    contact: "June Haverly",
    email: "desk@tallowcreek.test",
    phone: "+1 555 0199",
    lead_time_days: 21, // working days
    lead_time_sd_days: 4,
  },
];

const LOCATIONS = ["Bay A – rack 1", "Bay A – rack 2", "Bay B – floor", "Bay C – offcut shelves", "Curing room"];
const SIZES: Vec3[] = [
  [4877, 1219, 1219], // 16 × 4 × 4 ft
  [3658, 1219, 610], // 12 × 4 × 2 ft
  [4000, 1200, 1000],
  [2440, 1220, 610],
];
const KINDS = ["void", "poor_fusion", "crush", "wet_core", "inclusion"] as const;

export async function seed(knex: Knex): Promise<void> {
  await knex.raw(
    "TRUNCATE defect_photos, defect_zones, stock_ledger, blocks, deliveries, suppliers, grades, csv_imports RESTART IDENTITY CASCADE",
  );
  await knex.raw("ALTER SEQUENCE block_code_seq RESTART WITH 1001");
  const r = rng(20261201);
  const pick = <T>(xs: readonly T[]) => xs[Math.floor(r() * xs.length)]!;

  const grades = await knex("grades")
    .insert(
      GRADES.map((g) => ({
        code: g.code,
        material: g.material,
        grade_system: g.grade_system,
        grade: g.grade,
        nominal_density_kg_m3: g.nominal,
        min_density_kg_m3: g.min,
        cure_days: g.cure,
        never_hot_wire: g.material === "PU",
        colour: g.colour,
        price_unit: g.unit,
      })),
    )
    .returning(["id", "code", "cure_days", "min_density_kg_m3", "nominal_density_kg_m3", "material"]);
  const suppliers = await knex("suppliers").insert(SUPPLIERS).returning(["id", "name"]);
  const users = { buyer: "u-buyer", cutter: "u-cutter", planner: "u-planner" };

  // Twelve deliveries over the last ~95 days, newest ones still settling.
  const offsets = [-95, -88, -80, -71, -63, -55, -47, -38, -29, -20, -9, -3];
  let blockNo = 1001;
  const ledger: StockLedgerInsert[] = [];

  for (const [i, off] of offsets.entries()) {
    const supplier = suppliers[i % suppliers.length]!;
    const grade = grades[i === 7 ? 4 : i === 10 ? 5 : i % 4]!;
    const receivedOn = day(off);
    const lot = `L${iso(receivedOn).replace(/-/g, "").slice(2)}-${String.fromCharCode(65 + (i % 26))}`;
    const [delivery] = await knex("deliveries")
      .insert({
        supplier_id: supplier.id,
        received_on: iso(receivedOn),
        po_ref: `PO-${2400 + i}`,
        lot,
        received_by: users.buyer,
        notes: i === 5 ? "Two blocks had crushed corners from the forklift." : null,
        created_at: receivedOn,
      })
      .returning("id");
    if (!delivery) throw new Error("The delivery was not saved.");
    const count = grade.material === "PU" ? 2 : 4 + Math.floor(r() * 3);
    for (let j = 0; j < count; j++) {
      const size =
        grade.material === "XPS"
          ? ([2440, 1220, 100] as Vec3)
          : grade.material === "PU"
            ? ([1220, 610, 150] as Vec3)
            : pick(SIZES);
      const measured = size.map((s) => Math.round(s * (0.997 + r() * 0.004))) as Vec3;
      const vol = (measured[0] * measured[1] * measured[2]) / 1e9;
      const density = Number(grade.nominal_density_kg_m3) * (0.93 + r() * 0.12);
      const pricePerM3 = grade.material === "PU" ? 2900 : 55 + Number(grade.nominal_density_kg_m3) * 2.2;
      const cost = Math.round(vol * pricePerM3 * 100) / 100;
      const moulded = day(off - 1 - Math.floor(r() * 3));
      const cnb = day(off - 1 + grade.cure_days);
      const code = `HF-${blockNo++}`;
      const aged = off < -30;
      const fate = aged ? r() : 1;
      const status = fate < 0.3 ? "cut" : fate < 0.34 ? "written_off" : "in_stock";
      const location = off > -16 && grade.cure_days > 0 ? "Curing room" : pick(LOCATIONS.slice(0, 3));
      // The day a cut block was cut (07_cut_history plans it and records the cut on that day).
      const cutAt = status === "cut" ? day(Math.min(-2, off + grade.cure_days + 3 + Math.floor(r() * 20))) : null;
      const [block] = await knex("blocks")
        .insert({
          code,
          grade_id: grade.id,
          lot,
          delivery_id: delivery.id,
          nominal_x: size[0],
          nominal_y: size[1],
          nominal_z: size[2],
          size_x: measured[0],
          size_y: measured[1],
          size_z: measured[2],
          weight_kg: Math.round(vol * density * 100) / 100,
          cost,
          location,
          moulded_on: iso(moulded),
          cut_not_before: iso(cnb),
          status,
          created_at: receivedOn,
          ...(cutAt ? { updated_at: cutAt } : {}),
        })
        .returning(["id", "volume_m3"]);
      if (!block || block.volume_m3 === null) throw new Error(`Block ${code} was not saved.`);
      ledger.push({
        block_id: block.id,
        kind: "received",
        volume_m3: block.volume_m3,
        delta_m3: block.volume_m3,
        value: cost,
        delta_value: cost,
        user_id: users.buyer,
        at: receivedOn,
        reason: `Delivery ${delivery.id}, lot ${lot}`,
        ref: `delivery:${delivery.id}`,
      });
      if (status === "written_off") {
        const at = day(off + 10);
        ledger.push({
          block_id: block.id,
          kind: "scrapped",
          volume_m3: block.volume_m3,
          delta_m3: -block.volume_m3,
          value: cost,
          delta_value: -cost,
          user_id: users.buyer,
          at,
          reason: "Water damage: stored against the bay door",
          ref: null,
        });
      }
      // About one block in four has a defect zone found on receipt or at a cut face.
      if (r() < 0.27 && status !== "written_off") {
        const w = 60 + r() * 160,
          h = 40 + r() * 120,
          d = 40 + r() * 120;
        const x = 200 + r() * (measured[0] - 600),
          y = 80 + r() * (measured[1] - 320),
          z = 60 + r() * (measured[2] - 240);
        await knex("defect_zones").insert({
          block_id: block.id,
          kind: pick(KINDS),
          min_x: Number(x.toFixed(0)),
          min_y: Number(y.toFixed(0)),
          min_z: Number(z.toFixed(0)),
          max_x: Number(Math.min(measured[0], x + w).toFixed(0)),
          max_y: Number(Math.min(measured[1], y + h).toFixed(0)),
          max_z: Number(Math.min(measured[2], z + d).toFixed(0)),
          found_by: users.cutter,
          found_at: day(off + 2),
          note: "Seen on the end face after squaring.",
        });
      }
    }
  }

  for (let i = 0; i < ledger.length; i += 500) await knex("stock_ledger").insert(ledger.slice(i, i + 500));
  await knex.raw("SELECT setval('block_code_seq', ?)", [blockNo]);
}
