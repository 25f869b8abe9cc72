import type { RouteKey } from "@/lib/auth/policy";
import type { Role } from "@/lib/roles";
import { makeBlock, testDb } from "../support/db";
import { SETTINGS, makeApprovedRun, makeJobWithParts, makePlannedBlock } from "../support/planning-fixtures";
import { jpegBytes, makeDefect, makePhoto } from "../support/defect-fixtures";
import { makeJob, makeJobPart, makeLibraryPart } from "../support/job-fixtures";
import { makeOrder } from "../support/purchasing-fixtures";
import { LETTER_O, makeProfilePart, makeProfileRun } from "../support/profile-fixtures";
import { makeClaim, makeClaimPhoto, makeDeliveredBlock } from "../support/claim-fixtures";

export interface ExampleCtx {
  /** A throwaway user, for routes that act on a user. */
  makeUser(roles: Role[]): Promise<{ id: string; email: string }>;
  /** The signed-in caller's password (each matrix check signs in a fresh user). */
  password: string;
  /** The caller, when the check made one before asking for the example (routes that care who owns a record). */
  caller?: { id: string; roles: Role[] };
}

export interface Example {
  params?: Record<string, string>;
  /** Query string appended to the URL. */
  query?: string;
  body?: unknown;
  /** Content type of a raw (non-JSON) body. */
  contentType?: string;
  /** Files sent as multipart/form-data (instead of a JSON body). */
  files?: { field: string; name: string; content: Buffer; contentType?: string }[];
  /** Status a permitted caller must get (default: 2xx). */
  expect?: number;
}

/** A valid machine as the API takes it (invented figures). */
export const machineBody = (name: string) => ({
  name,
  kind: "block",
  wire: "horizontal",
  wireLength: 1300,
  travel: [5200, 1300],
  maxPiece: [5000, 1300, 1250],
  turntable: true,
  rapid: 2400,
  heatUpS: 20,
  handlingS: 90,
  dialect: { unitWords: "G20/G21", inch: false, heatOn: "M3", heatOff: "M5", axes: ["X", "Y"], lineNumbers: false },
});
const machineRow = {
  kind: "block",
  wire: "horizontal",
  wire_length_mm: 1300,
  travel_x_mm: 5200,
  travel_y_mm: 1300,
  max_length_mm: 5000,
  max_width_mm: 1300,
  max_height_mm: 1250,
} as const;

let n = 0;
const unique = () => `${Date.now().toString(36)}-${++n}`;

/**
 * A valid request for every route that needs more than a bare GET. The role matrix test fails
 * when a mutating route has no entry here, so a new route cannot slip past it.
 */
export const EXAMPLES: Partial<Record<RouteKey, (ctx: ExampleCtx) => Promise<Example>>> = {
  "POST /api/auth/sign-in": async (ctx) => {
    const u = await ctx.makeUser(["cutter"]);
    return { body: { email: u.email, password: ctx.password } };
  },
  "POST /api/auth/sign-out": async () => ({}),
  "POST /api/me/password": async (ctx) => ({
    body: { currentPassword: ctx.password, newPassword: `changed-${unique()}` },
  }),
  "PUT /api/settings": async () => ({
    body: {
      shopName: "Hollowfield Foamworks",
      displayUnits: "mm",
      kerf: 1.5,
      trim: 6,
      defectMargin: 10,
      minOffcut: [150, 150, 25],
      layout: "guillotine",
      feedMmPerMin: 300,
      nestingTimeLimitMs: 3000,
    },
  }),
  "POST /api/admin/users": async () => ({
    body: {
      email: `new-${unique()}@test.blockyard.test`,
      name: "New Person",
      roles: ["cutter"],
      password: "temporary-pass-1",
    },
    expect: 201,
  }),
  "GET /api/admin/users/[userId]": async (ctx) => ({ params: { userId: (await ctx.makeUser(["buyer"])).id } }),
  "PATCH /api/admin/users/[userId]": async (ctx) => ({
    params: { userId: (await ctx.makeUser(["buyer"])).id },
    body: { roles: ["buyer", "planner"] },
  }),
  "POST /api/admin/users/[userId]/password": async (ctx) => ({
    params: { userId: (await ctx.makeUser(["buyer"])).id },
    body: { password: "temporary-pass-2" },
  }),
  "POST /api/grades": async () => ({ body: gradeBody(`G-${unique()}`), expect: 201 }),
  "POST /api/machines": async () => ({ body: machineBody(`Cutter ${unique()}`), expect: 201 }),
  "GET /api/machines/[machineId]": async () => ({ params: { machineId: String(await firstId("machines")) } }),
  "PUT /api/machines/[machineId]": async () => {
    const [m] = await testDb()("machines")
      .insert({ ...machineRow, name: `Cutter ${unique()}` })
      .returning("id");
    return { params: { machineId: String(m!.id) }, body: machineBody(`Cutter ${unique()}`) };
  },
  "PUT /api/machines/[machineId]/grades": async () => ({
    params: { machineId: String(await firstId("machines")) },
    body: { grades: [{ gradeId: await firstId("grades"), kerf: 1.5, feed: 300 }] },
  }),
  "GET /api/grades/[gradeId]": async () => ({ params: { gradeId: String(await firstId("grades")) } }),
  "PUT /api/grades/[gradeId]": async () => {
    const [g] = await testDb()("grades")
      .insert({ code: `G-${unique()}`, material: "EPS", grade_system: "shop", grade: "test", cure_days: 1 })
      .returning("id");
    return { params: { gradeId: String(g!.id) }, body: gradeBody(`G-${unique()}`) };
  },
  "POST /api/suppliers": async () => ({ body: { name: `Supplier ${unique()}`, leadTimeDays: 10 }, expect: 201 }),
  "GET /api/suppliers/[supplierId]": async () => ({ params: { supplierId: String(await firstId("suppliers")) } }),
  "PUT /api/suppliers/[supplierId]": async () => {
    const [s] = await testDb()("suppliers")
      .insert({ name: `Supplier ${unique()}` })
      .returning("id");
    return { params: { supplierId: String(s!.id) }, body: { name: `Supplier ${unique()}`, leadTimeDays: 7 } };
  },
  "POST /api/deliveries": async () => ({
    body: {
      supplierId: await firstId("suppliers"),
      receivedOn: "2026-11-30",
      lot: `LOT-${unique()}`,
      blocks: [{ gradeId: await firstId("grades"), size: [1000, 500, 400], cost: 50, location: "Test bay" }],
    },
    expect: 201,
  }),
  "GET /api/deliveries/[deliveryId]": async () => ({ params: { deliveryId: String(await firstId("deliveries")) } }),
  "GET /api/blocks/[blockId]": async () => ({ params: { blockId: String((await makeBlock()).id) } }),
  "PATCH /api/blocks/[blockId]": async () => ({
    params: { blockId: String((await makeBlock()).id) },
    body: { location: "Bay B – floor" },
  }),
  "POST /api/blocks/[blockId]/scrap": async () => ({
    params: { blockId: String((await makeBlock()).id) },
    body: { reason: "Crushed by a forklift" },
  }),
  "POST /api/blocks/[blockId]/adjust": async () => ({
    params: { blockId: String((await makeBlock()).id) },
    body: { size: [1990, 1000, 500], reason: "Re-measured" },
  }),
  "POST /api/blocks/[blockId]/hold": async () => ({
    params: { blockId: String((await makeBlock()).id) },
    body: { reason: "wet", note: "Water in the core at the saw" },
  }),
  "POST /api/blocks/[blockId]/release": async () => ({
    params: { blockId: String((await makeDeliveredBlock({ onHold: true })).id) },
    body: { note: "Dried out in the curing room" },
  }),
  // Claims to suppliers.
  "POST /api/claims": async () => ({
    body: { reason: "wet", creditAsked: 60, blocks: [(await makeDeliveredBlock({ onHold: true })).code] },
    expect: 201,
  }),
  "GET /api/claims/[claimId]": async () => ({ params: { claimId: String((await makeClaim()).id) } }),
  "POST /api/claims/[claimId]/decide": async () => ({
    params: { claimId: String((await makeClaim()).id) },
    body: { outcome: "accepted", note: "Supplier agreed by phone" },
  }),
  "POST /api/claims/[claimId]/photos": async () => ({
    params: { claimId: String((await makeClaim()).id) },
    files: [{ field: "photos", name: "wet-core.jpg", content: await jpegBytes(320, 240), contentType: "image/jpeg" }],
    expect: 201,
  }),
  "GET /api/claims/[claimId]/photos/[photoId]": async () => {
    const claim = await makeClaim();
    return { params: { claimId: String(claim.id), photoId: String((await makeClaimPhoto(claim.id)).id) } };
  },
  "GET /api/blocks/[blockId]/defects": async () => ({ params: { blockId: String((await makeBlock()).id) } }),
  "POST /api/blocks/[blockId]/defects": async () => ({
    params: { blockId: String((await makeBlock()).id) },
    body: { kind: "void", min: [100, 100, 100], max: [200, 180, 160] },
    expect: 201,
  }),
  "POST /api/imports/deliveries": async () => ({
    query: "commit=0",
    contentType: "text/csv",
    body: "supplier,received_on,lot,grade,length_mm,width_mm,height_mm,cost,location\nAshcombe Bead & Block,2026-11-30,L-1,EPS-II,1000,500,400,50,Bay A\n",
  }),
  "POST /api/imports/stock-counts": async () => {
    const b = await makeBlock();
    return { query: "commit=0", contentType: "text/csv", body: `code,location\n${b.code},Bay A\n` };
  },
  "GET /api/stock-counts/check": async () => ({ query: `code=${encodeURIComponent((await makeBlock()).code)}` }),
  "POST /api/stock-counts": async () => {
    const b = await makeBlock();
    return { query: "commit=0", body: { location: "Bay A", counted: [{ code: b.code }] } };
  },
  "POST /api/runs": async () => {
    const block = await makeBlock();
    const { jobId } = await makeJobWithParts([
      { name: "Rib", quantity: 2, size: [300, 200, 100], gradeCode: "EPS-II" },
    ]);
    return {
      body: { jobIds: [jobId], blockIds: [block.id], settings: { ...SETTINGS, timeLimitMs: 500 } },
      expect: 201,
    };
  },
  "GET /api/runs/candidates": async () => ({
    query: `jobs=${(await makeJobWithParts([{ name: "Rib", quantity: 1, size: [300, 200, 100], gradeCode: "EPS-II" }])).jobId}`,
  }),
  "GET /api/runs/[runId]": async () => ({ params: { runId: String((await makePlannedBlock()).runId) } }),
  "GET /api/runs/[runId]/plan": async () => ({ params: { runId: String((await makePlannedBlock()).runId) } }),
  "POST /api/runs/[runId]/cancel": async () => {
    const { runId } = await makePlannedBlock();
    await testDb()("nesting_runs").where({ id: runId }).update({ status: "queued", plan: null });
    return { params: { runId: String(runId) } };
  },
  "POST /api/runs/[runId]/approve": async () => ({ params: { runId: String((await makePlannedBlock()).runId) } }),
  "POST /api/runs/[runId]/release": async () => ({ params: { runId: String((await makeApprovedRun()).runId) } }),
  "POST /api/runs/[runId]/replan": async () => {
    const { runId, partIds } = await makeApprovedRun();
    const run = await testDb()("nesting_runs").where({ id: runId }).first("plan");
    const plan = run!.plan!;
    plan.unplaced = [{ part: `jp-${partIds[0]}`, count: 1, reason: "test" }];
    await testDb()("nesting_runs")
      .where({ id: runId })
      .update({ plan: JSON.stringify(plan) });
    return { params: { runId: String(runId) }, expect: 201 };
  },
  "POST /api/runs/[runId]/blocks/[blockId]/cut": async () => {
    const { runId, block } = await makeApprovedRun();
    return { params: { runId: String(runId), blockId: String(block.id) }, body: { rejects: [], confirm: true } };
  },
  "POST /api/runs/[runId]/blocks/[blockId]/undo": async () => {
    const { runId, block } = await makeApprovedRun();
    const { client: http, demoEmail } = await import("../support/http");
    const c = http();
    await c.signIn(demoEmail("cutter"));
    await c.post(`/api/runs/${runId}/blocks/${block.id}/cut`, { rejects: [], confirm: true });
    return { params: { runId: String(runId), blockId: String(block.id) } };
  },
  "GET /api/runs/[runId]/blocks/[blockId]/steps": async () => {
    const { runId, block } = await makeApprovedRun();
    return { params: { runId: String(runId), blockId: String(block.id) } };
  },
  "PUT /api/runs/[runId]/blocks/[blockId]/steps/[step]": async () => {
    const { runId, block } = await makeApprovedRun();
    return { params: { runId: String(runId), blockId: String(block.id), step: "1" }, body: { done: true } };
  },
  "GET /api/runs/[runId]/cut-list": async () => ({ params: { runId: String((await makePlannedBlock()).runId) } }),
  "GET /api/runs/[runId]/profile-programs": async () => ({
    params: { runId: String((await makeProfileRun()).runId) },
  }),
  "GET /api/jobs/[jobId]/parts/[partId]/program": async () => {
    const jobId = await makeJob();
    return { params: { jobId: String(jobId), partId: String(await makeProfilePart(jobId, LETTER_O)) } };
  },
  "GET /api/runs/[runId]/gcode": async () => {
    const { runId, block } = await makePlannedBlock();
    return { params: { runId: String(runId) }, query: `block=${encodeURIComponent(block.code)}&step=1` };
  },
  "POST /api/defects/[defectId]/photos": async () => {
    const block = await makeBlock();
    return {
      params: { defectId: String(await makeDefect(block.id)) },
      files: [
        { field: "photos", name: "void-face.jpg", content: await jpegBytes(320, 240), contentType: "image/jpeg" },
      ],
      expect: 201,
    };
  },
  // A zone flagged by the caller: the cutter who flagged it may correct or remove it.
  "PATCH /api/defects/[defectId]": async ({ caller }) => {
    const block = await makeBlock();
    const id = await makeDefect(block.id);
    if (caller) await testDb()("defect_zones").where({ id }).update({ found_by: caller.id });
    return { params: { defectId: String(id) }, body: { max: [470, 380, 150], note: "Wider than first marked." } };
  },
  "DELETE /api/defects/[defectId]": async ({ caller }) => {
    const block = await makeBlock();
    const id = await makeDefect(block.id);
    if (caller) await testDb()("defect_zones").where({ id }).update({ found_by: caller.id });
    return { params: { defectId: String(id) } };
  },
  "GET /api/photos/[photoId]": async () => {
    const block = await makeBlock();
    return { params: { photoId: String((await makePhoto(await makeDefect(block.id))).id) } };
  },
  // Jobs and the part library.
  "POST /api/jobs": async () => ({
    body: { name: `Job ${unique()}`, customer: "Test customer", dueOn: "2026-12-24" },
    expect: 201,
  }),
  "GET /api/jobs/[jobId]": async () => ({ params: { jobId: String(await makeJob()) } }),
  "PATCH /api/jobs/[jobId]": async () => ({
    params: { jobId: String(await makeJob()) },
    body: { dueOn: "2026-12-31" },
  }),
  "POST /api/jobs/[jobId]/parts": async () => ({
    params: { jobId: String(await makeJob()) },
    body: { name: "Rib", quantity: 4, size: [400, 120, 20] },
    expect: 201,
  }),
  "PATCH /api/jobs/[jobId]/parts/[partId]": async () => {
    const jobId = await makeJob();
    return { params: { jobId: String(jobId), partId: String(await makeJobPart(jobId)) }, body: { quantity: 6 } };
  },
  "DELETE /api/jobs/[jobId]/parts/[partId]": async () => {
    const jobId = await makeJob();
    return { params: { jobId: String(jobId), partId: String(await makeJobPart(jobId)) } };
  },
  "POST /api/jobs/[jobId]/parts/import": async () => ({
    params: { jobId: String(await makeJob()) },
    query: "commit=0",
    contentType: "text/csv",
    body: "name,quantity,length_mm,width_mm,height_mm\nRib,4,400,120,20\n",
  }),
  "POST /api/library": async () => ({
    body: { kit: "Test kit", name: `Former ${unique()}`, size: [200, 150, 10] },
    expect: 201,
  }),
  "PATCH /api/library/[partId]": async () => ({
    params: { partId: String(await makeLibraryPart()) },
    body: { defaultQuantity: 3 },
  }),
  "POST /api/profiles/import": async () => ({
    files: [
      {
        field: "file",
        name: "square.dxf",
        contentType: "application/dxf",
        content: Buffer.from(
          "0\nSECTION\n2\nHEADER\n9\n$INSUNITS\n70\n4\n0\nENDSEC\n0\nSECTION\n2\nENTITIES\n0\nLWPOLYLINE\n5\n1F\n8\n0\n90\n4\n70\n1\n10\n0\n20\n0\n10\n50\n20\n0\n10\n50\n20\n50\n10\n0\n20\n50\n0\nENDSEC\n0\nEOF\n",
        ),
      },
    ],
  }),
  "PUT /api/reorder/settings": async () => ({
    body: { serviceLevel: 0.95, historyDays: 90, orderCost: 75, holdingCost: 18 },
  }),
  "PUT /api/reorder/[gradeId]": async () => ({
    params: { gradeId: String(await firstId("grades")) },
    body: { leadTimeDays: null, note: "role check" },
  }),
  "POST /api/reorder/draft": async () => ({
    body: { gradeIds: [(await testDb()("grades").where({ code: "EPS-II" }).first("id"))!.id] },
    expect: 201,
  }),
  "POST /api/reorder/alert": async () => ({}),
  "POST /api/purchase-orders": async () => ({
    body: {
      supplierId: await firstId("suppliers"),
      expectedOn: "2026-12-20",
      lines: [{ gradeId: await firstId("grades"), size: [2000, 1000, 500], quantity: 4, price: 0.4 }],
    },
    expect: 201,
  }),
  "GET /api/purchase-orders/[poId]": async () => ({ params: { poId: String((await makeOrder()).id) } }),
  "PUT /api/purchase-orders/[poId]": async () => ({
    params: { poId: String((await makeOrder()).id) },
    body: {
      supplierId: await firstId("suppliers"),
      lines: [{ gradeId: await firstId("grades"), size: [2000, 1000, 500], quantity: 5, price: 0.4 }],
    },
  }),
  "POST /api/purchase-orders/[poId]/send": async () => ({
    params: { poId: String((await makeOrder()).id) },
    body: { email: false },
  }),
  "POST /api/purchase-orders/[poId]/cancel": async () => ({
    params: { poId: String((await makeOrder({ status: "sent" })).id) },
    body: { reason: "Role check" },
  }),
  "POST /api/purchase-orders/[poId]/close": async () => ({
    params: { poId: String((await makeOrder({ status: "part_received", receivedM3: 1 })).id) },
    body: { reason: "Role check" },
  }),
  "POST /api/purchase-orders/[poId]/receive": async () => {
    const po = await makeOrder({ status: "sent", quantity: 1 });
    return {
      params: { poId: String(po.id) },
      body: {
        receivedOn: "2026-11-30",
        lot: `LOT-${unique()}`,
        blocks: [{ lineId: po.lineId, size: [2000, 1000, 500], location: "Test bay" }],
      },
      expect: 201,
    };
  },
  "GET /api/purchase-orders/[poId]/export": async () => ({ params: { poId: String((await makeOrder()).id) } }),
  "GET /api/reports/[report]": async () => ({
    params: { report: "stock-value" },
    query: "from=2026-09-01&to=2026-12-01",
  }),
};

function gradeBody(code: string) {
  return {
    code,
    material: "EPS",
    gradeSystem: "ASTM C578",
    grade: "Type II",
    nominalDensity: 23,
    minDensity: 21.6,
    cureDays: 14,
    neverHotWire: false,
    colour: "#3f8791",
    priceUnit: "bf",
  };
}

async function firstId(table: string): Promise<number> {
  const row = await testDb()(table).orderBy("id").first("id");
  return row.id as number;
}
