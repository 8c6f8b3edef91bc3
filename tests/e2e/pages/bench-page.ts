import { type Locator, type Page, expect } from "@playwright/test";

/** A job's bench tools page, found by role and label as a technician would use it. */
export class BenchPage {
  constructor(readonly page: Page) {}

  async open(path: string) {
    await this.page.goto(path);
    await expect(this.page.getByRole("heading", { level: 1, name: /^Bench tools/ })).toBeVisible();
  }

  section(name: "Torque log" | "Readings" | "Teardown log" | "Reassembly checklist" | "Parts"): Locator {
    return this.page.getByRole("region", { name, exact: true });
  }

  /** A step in the teardown log (removal order). */
  teardownStep(removed: string): Locator {
    // Direct children only: a step's own history is a list inside it.
    return this.section("Teardown log").getByRole("list", { name: "Teardown steps in removal order" }).locator(":scope > li").filter({ hasText: removed });
  }

  async logStep(removed: string, notes: string, storage?: string) {
    const form = this.section("Teardown log");
    await form.getByLabel(/^What came off/).fill(removed);
    await form.getByLabel("Notes (optional)").fill(notes);
    if (storage) await form.getByLabel("Kept in (optional)").fill(storage);
    await form.getByRole("button", { name: "Log step" }).click();
    await expect(this.teardownStep(removed)).toBeVisible();
  }

  async addTorqueSpec(removed: string, spec: { value: string; unitLabel: string; bolts?: string }) {
    const step = this.teardownStep(removed);
    await step.getByText("Add torque spec").click();
    await step.getByLabel(/^Torque/).fill(spec.value);
    await step.getByLabel("Unit").selectOption({ label: spec.unitLabel });
    if (spec.bolts) await step.getByLabel("Bolts").fill(spec.bolts);
    await step.getByRole("button", { name: "Save torque spec" }).click();
    await expect(step).toContainText("Goes back on at");
  }

  /** The reassembly checklist's items whose text includes `tag`, in checklist order. */
  checklist(tag: string): Locator {
    return this.section("Reassembly checklist").getByRole("list", { name: "Reassembly steps, in order" }).getByRole("listitem").filter({ hasText: tag });
  }

  /** Steps done and in total so far, read from the progress bar (none yet: 0 of 0). */
  async progressCounts(): Promise<{ done: number; total: number }> {
    const bar = this.section("Reassembly checklist").getByRole("progressbar");
    if ((await bar.count()) === 0) return { done: 0, total: 0 };
    const [, done, total] = /(\d+) of (\d+)/.exec((await bar.getAttribute("aria-valuetext")) ?? "") ?? [];
    return { done: Number(done), total: Number(total) };
  }

  async markDone(removed: string) {
    const item = this.checklist(removed);
    await item.getByRole("button", { name: `Mark done: ${removed}` }).click();
    await expect(item.getByRole("button", { name: `Undo: ${removed}` })).toBeVisible();
  }

  async logTorque(t: { fastener: string; spec: string; unitLabel: string; applied?: string; bolts?: string; share?: boolean; angle?: string; angleDone?: boolean; threads?: string; oneTime?: boolean }) {
    const form = this.section("Torque log");
    await form.getByLabel(/^What was torqued/).fill(t.fastener);
    await form.getByLabel(/^Spec torque/).fill(t.spec);
    // A typed number is labelled by the unit chosen after it (only a picked spec is converted).
    await form.getByLabel("Unit", { exact: true }).selectOption({ label: t.unitLabel });
    if (t.applied) await form.getByLabel(/^Applied/).fill(t.applied);
    if (t.bolts) await form.getByLabel("Bolts in the circle (optional)").fill(t.bolts);
    // Issue 18 §4: angle stages after the torque, the threads, one-time fasteners.
    if (t.angle) await form.getByLabel("Then turn, degrees").fill(t.angle);
    if (t.angleDone) await form.getByLabel("Angle stages turned, in order").check();
    if (t.threads) await form.getByLabel("Threads", { exact: true }).selectOption({ label: t.threads });
    if (t.oneTime) await form.getByLabel("One-time (torque-to-yield) fasteners: replace with new").check();
    if (t.share) await form.getByLabel("Share with the owner as proof").check();
    await form.getByRole("button", { name: "Log torque" }).click();
    const record = form.getByRole("list", { name: "Torque records" }).getByRole("listitem").filter({ hasText: t.fastener });
    await expect(record).toBeVisible();
    return record;
  }
}
