import type { Knex } from "knex";
import { partGeometry, type Point, type Profile } from "../../lib/profiles";
import type { Vec3 } from "../../lib/nesting";

/**
 * Demo jobs for Hollowfield Foamworks (all invented): a part library with the "Kestrel 1.6 m"
 * glider kit (NACA 2412 wing panels cut on the 4-axis machine, formers as polygons), and three
 * open jobs — glider kits in EPS-I, shopfront letters in EPS-II, pantomime props in EPS-VIII —
 * sized to fit the demo stock (db/seeds/02_stock.ts). Runs after the stock seed.
 */

type Part = {
  name: string;
  size?: Vec3;
  profile?: Profile;
  rotate?: "any" | "z" | "none";
  quantity: number;
  notes?: string;
};

const day = (offset: number) => {
  const d = new Date();
  d.setDate(d.getDate() + offset);
  return `${d.getFullYear()}-${String(d.getMonth() + 1).padStart(2, "0")}-${String(d.getDate()).padStart(2, "0")}`;
};

// A rounded fuselage former: an octagon w wide and h tall with corners cut by c.
const former = (w: number, h: number, c: number): Point[] => [
  [c, 0],
  [w - c, 0],
  [w, c],
  [w, h - c],
  [w - c, h],
  [c, h],
  [0, h - c],
  [0, c],
];

const KESTREL = "Kestrel 1.6 m glider";
const LIBRARY: (Part & { kit: string })[] = [
  {
    kit: KESTREL,
    name: "Inner wing panel",
    profile: { kind: "naca", code: "2412", chordMm: 230, tipChordMm: 200, spanMm: 420 },
    rotate: "none",
    quantity: 2,
    notes: "Cut as a left/right pair; 4-axis.",
  },
  {
    kit: KESTREL,
    name: "Outer wing panel",
    profile: { kind: "naca", code: "2412", chordMm: 200, tipChordMm: 130, spanMm: 380, sweepMm: 25 },
    rotate: "none",
    quantity: 2,
    notes: "Tapered and swept; 4-axis.",
  },
  {
    kit: KESTREL,
    name: "Tailplane",
    profile: { kind: "naca", code: "0009", chordMm: 120, tipChordMm: 90, spanMm: 320 },
    rotate: "none",
    quantity: 1,
  },
  {
    kit: KESTREL,
    name: "Fin",
    profile: {
      kind: "polygon",
      points: [
        [0, 0],
        [150, 0],
        [110, 170],
        [60, 170],
      ],
      extrudeMm: 10,
    },
    quantity: 1,
  },
  {
    kit: KESTREL,
    name: "Former F1",
    profile: { kind: "polygon", points: former(70, 80, 18), extrudeMm: 12 },
    quantity: 1,
  },
  {
    kit: KESTREL,
    name: "Former F2",
    profile: { kind: "polygon", points: former(62, 70, 16), extrudeMm: 12 },
    quantity: 1,
  },
  {
    kit: KESTREL,
    name: "Former F3",
    profile: { kind: "polygon", points: former(48, 54, 12), extrudeMm: 12 },
    quantity: 1,
  },
  { kit: KESTREL, name: "Fuselage core", size: [820, 80, 90], rotate: "z", quantity: 1 },
  { kit: "Stage stock", name: "Column drum", size: [500, 500, 450], quantity: 4 },
  { kit: "Stage stock", name: "Boulder blank", size: [900, 700, 600], quantity: 2 },
];

// Block capitals 600 mm tall, 100 mm deep (x along the wire is the depth).
const LETTERS: Record<string, Point[]> = {
  M: [
    [0, 0],
    [90, 0],
    [90, 400],
    [200, 200],
    [310, 400],
    [310, 0],
    [400, 0],
    [400, 600],
    [310, 600],
    [200, 380],
    [90, 600],
    [0, 600],
  ],
  I: [
    [0, 0],
    [100, 0],
    [100, 600],
    [0, 600],
  ],
  L: [
    [0, 0],
    [320, 0],
    [320, 100],
    [100, 100],
    [100, 600],
    [0, 600],
  ],
  E: [
    [0, 0],
    [320, 0],
    [320, 100],
    [100, 100],
    [100, 250],
    [260, 250],
    [260, 350],
    [100, 350],
    [100, 500],
    [320, 500],
    [320, 600],
    [0, 600],
  ],
  H: [
    [0, 0],
    [100, 0],
    [100, 250],
    [260, 250],
    [260, 0],
    [360, 0],
    [360, 600],
    [260, 600],
    [260, 350],
    [100, 350],
    [100, 600],
    [0, 600],
  ],
};

export async function seed(knex: Knex): Promise<void> {
  await knex.raw("TRUNCATE job_parts, jobs, library_parts RESTART IDENTITY CASCADE");
  const grades = new Map<string, number>(
    (await knex("grades").select("id", "code")).map((g: { id: number; code: string }) => [g.code, g.id]),
  );
  const geometry = (p: Part) => (p.profile ? partGeometry(p.profile) : { size: p.size!, trueVolumeMm3: null });
  const row = (p: Part, gradeId: number | null) => {
    const g = geometry(p);
    return {
      name: p.name,
      size_x: g.size[0],
      size_y: g.size[1],
      size_z: g.size[2],
      grade_id: gradeId,
      rotate: p.rotate ?? "any",
      profile: p.profile ? JSON.stringify(p.profile) : null,
      true_volume_mm3: g.trueVolumeMm3,
    };
  };

  const libIds = new Map<string, number>();
  for (const p of LIBRARY) {
    const [l] = await knex("library_parts")
      .insert({
        ...row(p, p.kit === KESTREL ? grades.get("EPS-I")! : null),
        kit: p.kit,
        default_quantity: p.quantity,
        notes: p.notes ?? null,
      })
      .returning("id");
    libIds.set(p.name, l!.id);
  }

  const job = async (
    name: string,
    customer: string,
    due: number,
    notes: string | null,
    parts: (Part & { grade: string | null; library?: string })[],
  ) => {
    const [j] = await knex("jobs")
      .insert({ name, customer, due_on: day(due), status: "open", notes, created_by: "u-planner" })
      .returning("id");
    if (!j) throw new Error(`Job ${name} was not saved.`);
    await knex("job_parts").insert(
      parts.map((p) => ({
        ...row(p, p.grade ? grades.get(p.grade)! : null),
        job_id: j.id,
        quantity: p.quantity,
        library_part_id: p.library ? libIds.get(p.library)! : null,
      })),
    );
    await knex("audit_log").insert({
      actor_id: "u-planner",
      action: "job.create",
      subject: `job:${j.id}`,
      detail: { name, seeded: true },
    });
  };

  // Twelve Kestrel kits for a model flying club.
  const kits = 12;
  await job(
    "Kestrel kits — batch 3",
    "Larkspur Model Flyers",
    9,
    "Club order: twelve complete kits. Wing cores in EPS-I, left/right pairs.",
    LIBRARY.filter((p) => p.kit === KESTREL).map((p) => ({
      ...p,
      quantity: p.quantity * kits,
      grade: "EPS-I",
      library: p.name,
    })),
  );

  // Shopfront letters "MILE HILL": M, I ×2, L ×3, E, H.
  const counts: Record<string, number> = { M: 1, I: 2, L: 3, E: 1, H: 1 };
  await job(
    "Shopfront letters “MILE HILL”",
    "Copperleaf Signs",
    5,
    "600 mm capitals, 100 mm deep, for hard-coating on site.",
    Object.entries(counts).map(([ch, n]) => ({
      name: `Letter ${ch}`,
      profile: { kind: "polygon", points: LETTERS[ch]!, extrudeMm: 100 },
      rotate: "any",
      quantity: n,
      grade: "EPS-II",
    })),
  );

  // Pantomime props for a touring stage company.
  await job("Harbour panto props", "Meridian Stage Co.", 16, null, [
    { name: "Boulder blank", size: [900, 700, 600], quantity: 4, grade: "EPS-VIII", library: "Boulder blank" },
    { name: "Column drum", size: [500, 500, 450], quantity: 6, grade: "EPS-VIII", library: "Column drum" },
    {
      name: "Ship's wheel blank",
      profile: { kind: "polygon", points: former(760, 760, 220), extrudeMm: 90 },
      quantity: 2,
      grade: "EPS-VIII",
    },
    {
      name: "Wave row",
      profile: {
        kind: "polygon",
        points: [
          [0, 0],
          [1100, 0],
          [1100, 260],
          [960, 380],
          [820, 250],
          [680, 390],
          [540, 250],
          [400, 380],
          [260, 250],
          [120, 390],
          [0, 270],
        ],
        extrudeMm: 1200,
      },
      rotate: "z",
      quantity: 3,
      grade: "EPS-VIII",
    },
  ]);
}
