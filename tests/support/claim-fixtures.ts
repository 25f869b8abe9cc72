import crypto from "node:crypto";
import sharp from "sharp";
import { testDb } from "./db";
import { jpegBytes } from "./defect-fixtures";
import { putObject } from "@/lib/storage/client";

const tag = () => crypto.randomBytes(4).toString("hex").toUpperCase();

/**
 * A supplier of the test's own and a block it delivered (EPS-II, 2000 × 1000 × 500 mm unless told),
 * received through the ledger like every block, optionally already on hold.
 */
export async function makeDeliveredBlock(
  opts: { supplierId?: number; gradeCode?: string; onHold?: boolean; weightKg?: number | null } = {},
) {
  const k = testDb();
  const supplierId =
    opts.supplierId ??
    (
      await k("suppliers")
        .insert({ name: `Claim supplier ${tag()}` })
        .returning("id")
    )[0]!.id;
  const grade = await k("grades")
    .where({ code: opts.gradeCode ?? "EPS-II" })
    .first("id");
  const [delivery] = await k("deliveries")
    .insert({ supplier_id: supplierId, received_on: "2026-11-20", lot: `CL-${tag()}` })
    .returning(["id", "lot"]);
  const [block] = await k("blocks")
    .insert({
      code: `CB-${tag()}`,
      grade_id: grade!.id,
      lot: delivery!.lot,
      delivery_id: delivery!.id,
      nominal_x: 2000,
      nominal_y: 1000,
      nominal_z: 500,
      size_x: 2000,
      size_y: 1000,
      size_z: 500,
      weight_kg: opts.weightKg ?? null,
      cost: 120,
      location: "Claim bay",
      cut_not_before: "2020-01-01",
      status: opts.onHold ? "on_hold" : "in_stock",
      ...(opts.onHold ? { hold_reason: "wet", hold_note: "test fixture", held_at: k.fn.now() } : {}),
    })
    .returning(["id", "code", "volume_m3"]);
  await k("stock_ledger").insert({
    block_id: block!.id,
    kind: "received",
    volume_m3: block!.volume_m3!,
    delta_m3: block!.volume_m3!,
    value: 120,
    delta_value: 120,
    reason: "test fixture",
  });
  return { id: block!.id as number, code: block!.code as string, supplierId };
}

/** An open claim for one delivered block (straight into the database). */
export async function makeClaim(opts: { status?: "open" | "accepted" | "rejected" | "credited" } = {}) {
  const k = testDb();
  const block = await makeDeliveredBlock();
  const status = opts.status ?? "open";
  const [claim] = await k("supplier_claims")
    .insert({
      supplier_id: block.supplierId,
      reason: "wet",
      credit_asked: 50,
      status,
      credit_received: status === "credited" ? 40 : null,
      decided_at: status === "open" ? null : k.fn.now(),
    })
    .returning("id");
  await k("supplier_claim_blocks").insert({ claim_id: claim!.id, block_id: block.id });
  return { id: claim!.id as number, block };
}

/** A claim photo already in the bucket and the table, for routes that only read it. */
export async function makeClaimPhoto(claimId: number) {
  const bytes = await jpegBytes(320, 240);
  const thumb = await sharp(bytes).resize({ width: 160 }).webp().toBuffer();
  const id = crypto.randomUUID();
  const keys = { objectKey: `claims/${claimId}/${id}.jpg`, thumbKey: `claims/${claimId}/${id}.thumb.webp` };
  await putObject(keys.objectKey, bytes, "image/jpeg");
  await putObject(keys.thumbKey, thumb, "image/webp");
  const [row] = await testDb()("supplier_claim_photos")
    .insert({
      claim_id: claimId,
      object_key: keys.objectKey,
      thumb_key: keys.thumbKey,
      content_type: "image/jpeg",
      bytes: bytes.length,
      width: 320,
      height: 240,
    })
    .returning("id");
  return { id: row!.id as number, ...keys };
}
