import type { Knex } from "knex";
import { TORQUE_UNIT_IDS } from "../../lib/torque";

// Issue 18 §3–4: a torque record names the wrench it was done with (serial, calibration date,
// maximum: a pass below 20 % of it is outside the wrench's calibrated range), and how the
// fastener is tightened: angle stages after the torque ("20 N·m + 90°"), loosen-and-retorque with
// its sequence, the thread lubrication and one-time (torque-to-yield) fasteners. A teardown step's
// torque keeps the angle stages, lubrication and one-time flag for the reassembly checklist.
// Rows written before this stay null / false: views read them as before.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("torque_records", (t) => {
    t.string("tool_serial", 60).nullable();
    t.date("calibrated_on").nullable();
    t.decimal("wrench_max_value", 10, 3).unsigned().nullable();
    t.enum("wrench_max_unit", [...TORQUE_UNIT_IDS]).nullable();
    // JSON list of degrees, e.g. [90, 90].
    t.string("angle_stages", 60).nullable();
    t.boolean("angle_done").nullable();
    t.boolean("loosen_retorque").nullable();
    t.string("retorque_sequence", 300).nullable();
    t.string("lubrication", 16).nullable();
    t.string("lubrication_other", 60).nullable();
    t.boolean("one_time").nullable();
  });
  await knex.schema.alterTable("teardown_steps", (t) => {
    t.string("torque_angle_stages", 60).nullable();
    t.string("torque_lubrication", 16).nullable();
    t.boolean("torque_one_time").notNullable().defaultTo(false);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("teardown_steps", (t) => {
    t.dropColumn("torque_angle_stages");
    t.dropColumn("torque_lubrication");
    t.dropColumn("torque_one_time");
  });
  await knex.schema.alterTable("torque_records", (t) => {
    for (const c of ["tool_serial", "calibrated_on", "wrench_max_value", "wrench_max_unit", "angle_stages", "angle_done", "loosen_retorque", "retorque_sequence", "lubrication", "lubrication_other", "one_time"]) t.dropColumn(c);
  });
}
