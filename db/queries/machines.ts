import "server-only";
import type { Knex } from "knex";
import { db } from "@/db/client";
import type { JobPartsTable, JobsTable, MachinesTable, ReadingsTable, TorqueRecordsTable } from "@/db/tables";
import type { PartStatus } from "@/lib/bench";
import type { JobStatus } from "@/lib/job-status";
import type { MachineKind } from "@/lib/machine";
import type { ReadingVerdict } from "@/lib/readings";
import type { TorqueUnit } from "@/lib/torque";
import { WRENCH_CLASSES, isWrenchClass } from "@/lib/torque-check";

// A machine's page: the machine and its service history across every job it came in for.

export type MachineRow = {
  id: number;
  shopId: number;
  customerId: number;
  customerName: string;
  kind: MachineKind;
  year: number | null;
  make: string;
  model: string;
  engineCc: number | null;
  serial: string | null;
  hours: number | null;
  odometer: number | null;
  odometerUnit: "km" | "mi" | null;
};

/** One of this shop's machines with its owner's name, or null (another shop's id finds nothing). */
export async function getMachine({ shopId, machineId }: { shopId: number; machineId: number }, k: Knex = db()): Promise<MachineRow | null> {
  const r: (MachinesTable & { customer_name: string }) | undefined = await k("machines as m")
    .join("customers as c", (j) => j.on("c.shop_id", "m.shop_id").andOn("c.id", "m.customer_id"))
    .where({ "m.shop_id": shopId, "m.id": machineId })
    .first("m.*", "c.name as customer_name");
  if (!r) return null;
  const n = (v: number | null) => (v == null ? null : Number(v));
  return {
    id: Number(r.id),
    shopId: Number(r.shop_id),
    customerId: Number(r.customer_id),
    customerName: r.customer_name,
    kind: r.kind,
    year: n(r.year),
    make: r.make,
    model: r.model,
    engineCc: n(r.engine_cc),
    serial: r.serial ?? null,
    hours: n(r.hours),
    odometer: n(r.odometer),
    odometerUnit: r.odometer_unit ?? null,
  };
}

/** The job a history row came from, for its link. */
type JobRef = { jobNumber: number };

export type MachineHistory = {
  jobs: {
    number: number;
    status: JobStatus;
    concern: string;
    createdAt: Date;
    customerName: string;
  }[];
  readings: (JobRef & {
    id: number;
    label: string;
    value: number;
    unit: string | null;
    verdict: ReadingVerdict;
    /** Decimals typed (the instrument's resolution); null on readings from before migration 25. */
    valueDecimals: number | null;
    at: Date;
  })[];
  parts: (JobRef & {
    id: number;
    description: string;
    partNumber: string | null;
    status: PartStatus;
    qtyThousandths: number;
    costMinor: number | null;
    at: Date;
  })[];
  torque: (JobRef & {
    id: number;
    fastener: string;
    specValue: number;
    appliedValue: number | null;
    unit: TorqueUnit;
    /** Null on records made before tolerances were kept (lib/bench.ts toleranceOf reads the default). */
    tolerancePct: number | null;
    at: Date;
  })[];
};

/**
 * Everything recorded on the machine's jobs, newest first: the jobs, readings (chain wear and the
 * rest, by date), parts fitted or received, and torque records. Four queries whatever the history's length.
 */
export async function getMachineHistory({ shopId, machineId }: { shopId: number; machineId: number }): Promise<MachineHistory> {
  const onJob = (alias: string) => (j: Knex.JoinClause) => j.on("j.shop_id", `${alias}.shop_id`).andOn("j.id", `${alias}.job_id`);
  const jobs: (Pick<JobsTable, "number" | "status" | "concern" | "created_at"> & { customer_name: string })[] = await db()("jobs as j")
    .join("customers as c", (jn) => jn.on("c.shop_id", "j.shop_id").andOn("c.id", "j.customer_id"))
    .where({ "j.shop_id": shopId, "j.machine_id": machineId })
    .orderBy("j.created_at", "desc")
    .orderBy("j.number", "desc")
    .select("j.number", "j.status", "j.concern", "j.created_at", "c.name as customer_name");
  const readings: (Pick<ReadingsTable, "id" | "label" | "value" | "unit" | "verdict" | "value_decimals" | "created_at"> & { job_number: number })[] = await db()("readings as r")
    .join("jobs as j", onJob("r"))
    .where({ "r.shop_id": shopId, "j.machine_id": machineId })
    .orderBy("r.created_at", "desc")
    .orderBy("r.id", "desc")
    .select("r.id", "r.label", "r.value", "r.unit", "r.verdict", "r.value_decimals", "r.created_at", "j.number as job_number");
  // Parts that reached the machine (received or fitted); needed, ordered or returned ones aren't history.
  const parts: (Pick<JobPartsTable, "id" | "description" | "part_number" | "status" | "qty_thousandths" | "cost_minor" | "updated_at"> & { job_number: number })[] = await db()(
    "job_parts as p",
  )
    .join("jobs as j", onJob("p"))
    .where({ "p.shop_id": shopId, "j.machine_id": machineId })
    .whereIn("p.status", ["received", "fitted"])
    .orderBy("p.updated_at", "desc")
    .orderBy("p.id", "desc")
    .select("p.id", "p.description", "p.part_number", "p.status", "p.qty_thousandths", "p.cost_minor", "p.updated_at", "j.number as job_number");
  const torque: (Pick<TorqueRecordsTable, "id" | "fastener" | "spec_value" | "applied_value" | "unit" | "tolerance_pct" | "wrench_class" | "created_at"> & { job_number: number })[] = await db()(
    "torque_records as t",
  )
    .join("jobs as j", onJob("t"))
    .where({ "t.shop_id": shopId, "j.machine_id": machineId })
    .orderBy("t.created_at", "desc")
    .orderBy("t.id", "desc")
    .select("t.id", "t.fastener", "t.spec_value", "t.applied_value", "t.unit", "t.tolerance_pct", "t.wrench_class", "t.created_at", "j.number as job_number");
  return {
    jobs: jobs.map((j) => ({
      number: Number(j.number),
      status: j.status,
      concern: j.concern,
      createdAt: j.created_at,
      customerName: j.customer_name,
    })),
    readings: readings.map((r) => ({
      id: Number(r.id),
      jobNumber: Number(r.job_number),
      label: r.label,
      value: Number(r.value),
      unit: r.unit ?? null,
      verdict: r.verdict,
      valueDecimals: r.value_decimals == null ? null : Number(r.value_decimals),
      at: r.created_at,
    })),
    parts: parts.map((p) => ({
      id: Number(p.id),
      jobNumber: Number(p.job_number),
      description: p.description,
      partNumber: p.part_number ?? null,
      status: p.status,
      qtyThousandths: Number(p.qty_thousandths),
      costMinor: p.cost_minor == null ? null : Number(p.cost_minor),
      at: p.updated_at,
    })),
    torque: torque.map((t) => ({
      id: Number(t.id),
      jobNumber: Number(t.job_number),
      fastener: t.fastener,
      specValue: Number(t.spec_value),
      appliedValue: t.applied_value == null ? null : Number(t.applied_value),
      unit: t.unit,
      tolerancePct: t.tolerance_pct == null ? (isWrenchClass(t.wrench_class) ? WRENCH_CLASSES[t.wrench_class].tolerancePct : null) : Number(t.tolerance_pct),
      at: t.created_at,
    })),
  };
}
