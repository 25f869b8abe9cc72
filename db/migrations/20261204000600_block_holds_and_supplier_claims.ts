import type { Knex } from "knex";

/**
 * Suspect blocks are held out of usable stock, and the supplier is claimed against:
 * - `blocks.status = 'on_hold'` with `hold_reason` (under_density | over_density | wet | damaged |
 *   reweigh), `hold_note`, `held_at`, `held_by`: a held block is neither on hand for reorder sums nor
 *   free to plan (both read `in_stock`/`earmarked` only) until it is released to `in_stock`. A block
 *   received outside its grade's density is held on receipt. A held block always has its reason
 *   (cleared again when it leaves the hold).
 * - ledger kinds `held` and `hold_released`: zero movements (like `reserved`/`released`) that keep
 *   who held or released a block, when and why, in its history.
 * - `supplier_claims` (reason, note, credit asked, status open | accepted | rejected | credited,
 *   credit received, the decision), their blocks (`supplier_claim_blocks`) and photos
 *   (`supplier_claim_photos`, stored like defect photos).
 */

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("blocks", (t) => {
    t.text("hold_reason").nullable();
    t.text("hold_note").nullable();
    t.timestamp("held_at", { useTz: true }).nullable();
    t.text("held_by").nullable().references("users.id");
  });
  await knex.raw(`ALTER TABLE blocks DROP CONSTRAINT blocks_status`);
  await knex.raw(
    `ALTER TABLE blocks ADD CONSTRAINT blocks_status CHECK (status IN ('in_stock','earmarked','on_hold','cut','written_off'))`,
  );
  await knex.raw(
    `ALTER TABLE blocks ADD CONSTRAINT blocks_hold_reason CHECK (hold_reason IS NULL OR hold_reason IN ('under_density','over_density','wet','damaged','reweigh'))`,
  );
  await knex.raw(
    `ALTER TABLE blocks ADD CONSTRAINT blocks_hold CHECK (status <> 'on_hold' OR (hold_reason IS NOT NULL AND held_at IS NOT NULL))`,
  );
  await knex.raw(`CREATE INDEX blocks_on_hold ON blocks (grade_id) WHERE status = 'on_hold'`);

  await knex.raw(`ALTER TABLE stock_ledger DROP CONSTRAINT ledger_kind`);
  await knex.raw(
    `ALTER TABLE stock_ledger ADD CONSTRAINT ledger_kind CHECK (kind IN ('received','reserved','released','consumed','offcut_created','scrapped','adjusted','reversed','held','hold_released'))`,
  );

  await knex.schema.createTable("supplier_claims", (t) => {
    t.increments("id");
    t.integer("supplier_id").notNullable().references("suppliers.id");
    t.text("reason").notNullable();
    t.text("note").nullable();
    t.decimal("credit_asked", 12, 2).notNullable().defaultTo(0);
    t.text("status").notNullable().defaultTo("open");
    t.decimal("credit_received", 12, 2).nullable();
    t.text("decision_note").nullable();
    t.timestamp("decided_at", { useTz: true }).nullable();
    t.text("decided_by").nullable().references("users.id");
    t.text("created_by").nullable().references("users.id");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["supplier_id", "created_at"]);
    t.index(["status"]);
  });
  await knex.raw(
    `ALTER TABLE supplier_claims ADD CONSTRAINT supplier_claims_reason CHECK (reason IN ('under_density','over_density','wet','damaged','wrong_size','other'))`,
  );
  await knex.raw(
    `ALTER TABLE supplier_claims ADD CONSTRAINT supplier_claims_status CHECK (status IN ('open','accepted','rejected','credited'))`,
  );
  await knex.raw(
    `ALTER TABLE supplier_claims ADD CONSTRAINT supplier_claims_money CHECK (credit_asked >= 0 AND (credit_received IS NULL OR credit_received >= 0) AND (status <> 'credited' OR credit_received IS NOT NULL) AND ((status = 'open') = (decided_at IS NULL)))`,
  );

  await knex.schema.createTable("supplier_claim_blocks", (t) => {
    t.integer("claim_id").notNullable().references("supplier_claims.id").onDelete("CASCADE");
    t.integer("block_id").notNullable().references("blocks.id");
    t.primary(["claim_id", "block_id"]);
    t.index(["block_id"]);
  });

  await knex.schema.createTable("supplier_claim_photos", (t) => {
    t.increments("id");
    t.integer("claim_id").notNullable().references("supplier_claims.id");
    t.text("object_key").notNullable().unique();
    t.text("thumb_key").notNullable();
    t.text("content_type").notNullable();
    t.integer("bytes").notNullable();
    t.integer("width").nullable();
    t.integer("height").nullable();
    t.text("uploaded_by").nullable().references("users.id");
    t.timestamp("uploaded_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["claim_id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists("supplier_claim_photos");
  await knex.schema.dropTableIfExists("supplier_claim_blocks");
  await knex.schema.dropTableIfExists("supplier_claims");
  // The ledger is append-only: once a hold was recorded its rows stay, and so do their kinds.
  const used = await knex("stock_ledger").whereIn("kind", ["held", "hold_released"]).first("id");
  if (!used) {
    await knex.raw(`ALTER TABLE stock_ledger DROP CONSTRAINT ledger_kind`);
    await knex.raw(
      `ALTER TABLE stock_ledger ADD CONSTRAINT ledger_kind CHECK (kind IN ('received','reserved','released','consumed','offcut_created','scrapped','adjusted','reversed'))`,
    );
  }
  await knex.raw(
    `UPDATE blocks SET status = 'in_stock', hold_reason = NULL, hold_note = NULL, held_at = NULL, held_by = NULL WHERE status = 'on_hold'`,
  );
  await knex.raw(`DROP INDEX IF EXISTS blocks_on_hold`);
  await knex.raw(`ALTER TABLE blocks DROP CONSTRAINT blocks_hold`);
  await knex.raw(`ALTER TABLE blocks DROP CONSTRAINT blocks_hold_reason`);
  await knex.raw(`ALTER TABLE blocks DROP CONSTRAINT blocks_status`);
  await knex.raw(
    `ALTER TABLE blocks ADD CONSTRAINT blocks_status CHECK (status IN ('in_stock','earmarked','cut','written_off'))`,
  );
  await knex.schema.alterTable("blocks", (t) => {
    t.dropColumn("held_by");
    t.dropColumn("held_at");
    t.dropColumn("hold_note");
    t.dropColumn("hold_reason");
  });
}
