import { migrationSource } from "@/db/migrations";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { freshDatabase } from "../support/db";

const TABLES = ["shops", "users", "memberships", "customers", "customer_merges", "machines", "jobs", "job_status_changes", "sign_in_links", "auth_attempts", "journal_entries", "journal_entry_revisions", "photos", "shop_bench_settings", "torque_records", "readings", "teardown_steps", "teardown_step_revisions", "job_parts", "job_part_events", "spec_entries", "shop_money_settings", "findings", "finding_evidence", "finding_lines", "approval_requests", "approval_decisions", "approval_decision_lines", "outbox", "job_subscribers", "job_update_queue", "job_alerts", "invoices", "invoice_lines", "deposit_requests", "payment_checkouts", "payments", "payment_webhook_events", "shop_profiles", "stories", "story_items", "story_consents", "clips", "clip_moments", "video_webhook_events", "user_sessions", "shop_setting_changes", "dropoff_authorisations", "staff_invites", "password_resets", "shop_signups", "measurement_sets", "measurement_items", "job_status_counts", "job_technician_counts", "part_orders", "shop_parts_markup", "job_questions", "job_reply_tokens", "mail_webhook_events", "idempotency_keys", "text_consent_log", "text_outbox", "text_status_events", "text_inbound", "page_versions"];

describe("migrations on an empty database", () => {
  let fresh: Awaited<ReturnType<typeof freshDatabase>>;
  let db: Knex;
  const tables = async () =>
    (await db("information_schema.tables").where({ table_schema: db.client.database() }).select("table_name as name", "engine", "table_collation as collation")) as {
      name: string;
      engine: string;
      collation: string;
    }[];

  beforeAll(async () => {
    fresh = await freshDatabase();
    db = fresh.knex;
  });
  afterAll(async () => fresh?.drop());

  it("go up: every table exists, InnoDB, utf8mb4", async () => {
    await db.migrate.latest();
    const found = await tables();
    for (const name of TABLES) {
      const t = found.find((x) => x.name === name);
      expect(t, name).toBeDefined();
      expect(t!.engine).toBe("InnoDB");
      expect(t!.collation).toMatch(/^utf8mb4_/);
    }
    // Columns added to existing tables by later migrations.
    expect(await db.schema.hasColumn("memberships", "deactivated_at")).toBe(true);
    expect(await db.schema.hasColumn("shops", "opening_hours")).toBe(true);
    expect(await db.schema.hasColumn("shop_money_settings", "labour_rates")).toBe(true);
    expect(await db.schema.hasColumn("shop_money_settings", "supplies_tax_rate_percent")).toBe(true);
    expect(await db.schema.hasColumn("customers", "contact_preference")).toBe(true);
    expect(await db.schema.hasColumn("customers", "notify_channels")).toBe(true);
    expect(await db.schema.hasColumn("shops", "sms_from")).toBe(true);
    expect(await db.schema.hasColumn("shops", "sms_languages")).toBe(true);
    expect(await db.schema.hasColumn("jobs", "customer_name")).toBe(true);
    expect(await db.schema.hasColumn("jobs", "promised_undated")).toBe(true);
    expect(await db.schema.hasColumn("job_parts", "finding_line_id")).toBe(true);
    expect(await db.schema.hasColumn("finding_lines", "withdrawn_at")).toBe(true);
    expect(await db.schema.hasColumn("job_parts", "owner_answer")).toBe(true);
    expect(await db.schema.hasColumn("approval_requests", "line_ids")).toBe(true);
    expect(await db.schema.hasColumn("job_parts", "order_id")).toBe(true);
    expect(await db.schema.hasColumn("job_parts", "core_charge_minor")).toBe(true);
    expect(await db.schema.hasColumn("invoice_lines", "part_id")).toBe(true);
    expect(await db.schema.hasColumn("job_part_events", "note")).toBe(true);
    expect(await db.schema.hasColumn("torque_records", "tolerance_pct")).toBe(true);
    expect(await db.schema.hasColumn("torque_records", "check_pass_done")).toBe(true);
    expect(await db.schema.hasColumn("torque_records", "calibrated_on")).toBe(true);
    expect(await db.schema.hasColumn("torque_records", "angle_stages")).toBe(true);
    expect(await db.schema.hasColumn("teardown_steps", "torque_one_time")).toBe(true);
    expect(await db.schema.hasColumn("shop_bench_settings", "wrench_class")).toBe(true);
    expect(await db.schema.hasColumn("readings", "value_decimals")).toBe(true);
    expect(await db.schema.hasColumn("spec_entries", "min_decimals")).toBe(true);
    expect(await db.schema.hasColumn("teardown_steps", "torque_retorque_sequence")).toBe(true);
  }, 90_000); // every migration from nothing: some 20 s on a busy 2-core machine

  it("keep a job's customer and machine in the job's own shop (composite foreign keys)", async () => {
    const [a] = await db("shops").insert({ slug: "mig-a", name: "A" });
    const [b] = await db("shops").insert({ slug: "mig-b", name: "B" });
    const [customerB] = await db("customers").insert({ shop_id: b, name: "Someone at B" });
    const [machineB] = await db("machines").insert({ shop_id: b, customer_id: customerB, kind: "atv", make: "X", model: "Y" });
    await expect(
      db("jobs").insert({ shop_id: a, number: 1, public_id: "aaaaaaaaaaaaaaaa", customer_id: customerB, machine_id: machineB, concern: "x" }),
    ).rejects.toThrow(/foreign key constraint/i);
    await expect(db("jobs").insert({ shop_id: b, number: 1, public_id: "bbbbbbbbbbbbbbbb", customer_id: customerB, machine_id: machineB, concern: "x" })).resolves.toBeDefined();
    // The same number in two shops is fine; twice in one shop is not.
    await expect(db("jobs").insert({ shop_id: b, number: 1, public_id: "cccccccccccccccc", customer_id: customerB, machine_id: machineB, concern: "x" })).rejects.toThrow(
      /duplicate entry/i,
    );
    // The board's per-status counts follow every write to jobs (triggers of migration 29).
    const counts = async () => Object.fromEntries((await db("job_status_counts").where({ shop_id: b }).where("n", "<>", 0).select("status", "n")).map((r) => [r.status, r.n]));
    expect(await counts()).toEqual({ checked_in: 1 });
    await db("jobs").insert({ shop_id: b, number: 2, public_id: "dddddddddddddddd", customer_id: customerB, machine_id: machineB, concern: "y", status: "ready" });
    await db("jobs").where({ shop_id: b, number: 1 }).update({ status: "in_progress" });
    expect(await counts()).toEqual({ in_progress: 1, ready: 1 });
    await db("jobs").where({ shop_id: b, number: 2 }).update({ concern: "z" }); // not a move
    await db("jobs").where({ shop_id: b, number: 1 }).delete();
    expect(await counts()).toEqual({ ready: 1 });
    // And per technician (migration 40): assigned, moved, handed to another, unassigned, deleted.
    const [techA] = await db("users").insert({ email: "mig-tech-a@example.test", name: "A" });
    const [techB] = await db("users").insert({ email: "mig-tech-b@example.test", name: "B" });
    const byTech = async () =>
      Object.fromEntries((await db("job_technician_counts").where({ shop_id: b }).where("n", "<>", 0).select("technician_user_id", "status", "n")).map((r) => [`${r.technician_user_id === techA ? "A" : "B"} ${r.status}`, r.n]));
    await db("jobs").insert({ shop_id: b, number: 3, public_id: "eeeeeeeeeeeeeeee", customer_id: customerB, machine_id: machineB, concern: "t", status: "checked_in", technician_user_id: techA });
    await db("jobs").where({ shop_id: b, number: 2 }).update({ technician_user_id: techA });
    expect(await byTech()).toEqual({ "A checked_in": 1, "A ready": 1 });
    await db("jobs").where({ shop_id: b, number: 3 }).update({ status: "in_progress" });
    await db("jobs").where({ shop_id: b, number: 2 }).update({ technician_user_id: techB, status: "picked_up" });
    expect(await byTech()).toEqual({ "A in_progress": 1, "B picked_up": 1 });
    await db("jobs").where({ shop_id: b, number: 3 }).update({ technician_user_id: null });
    await db("jobs").where({ shop_id: b, number: 2 }).delete();
    expect(await byTech()).toEqual({});
  });

  it("keep English among the languages a shop texts in (migration 37)", async () => {
    const [id] = await db("shops").insert({ slug: "mig-lang", name: "Languages" });
    expect((await db("shops").where({ id }).first("sms_languages"))!.sms_languages).toBe("en");
    await db("shops").where({ id }).update({ sms_languages: "en,fr" });
    expect((await db("shops").where({ id }).first("sms_languages"))!.sms_languages).toBe("en,fr");
    await expect(db("shops").where({ id }).update({ sms_languages: "es" })).rejects.toThrow(/constraint/i);
    await expect(db("shops").where({ id }).update({ sms_languages: "en,de" })).rejects.toThrow(/truncated|incorrect|invalid/i);
  });

  it("go down completely, then up again", async () => {
    await db.migrate.rollback(undefined, true);
    const left = (await tables()).map((t) => t.name);
    for (const name of TABLES) expect(left).not.toContain(name);
    const [, names] = await db.migrate.latest();
    expect(names).toHaveLength((await migrationSource.getMigrations([])).length);
    expect((await tables()).map((t) => t.name)).toEqual(expect.arrayContaining(TABLES));
    // Twenty migrations down and up are some 250 DDL statements: up to a minute on a busy 2-core machine.
  }, 180_000);
});
