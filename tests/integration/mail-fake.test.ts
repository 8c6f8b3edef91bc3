// Drives fakes/mail with the real resend SDK, so the fake stays honest about the API shape the app relies on.
import { mkdtemp, readdir, rm } from "node:fs/promises";
import http from "node:http";
import os from "node:os";
import path from "node:path";
import { Resend, type CreateEmailOptions } from "resend";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createMailFake, type MailFake } from "../../fakes/mail/server";
import { clearMailbox, failNext, getMail, listMail, mailStats, waitForMail } from "../support/mailbox";

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;
const FROM = "Ridgeway Small Engines <service@ridgeway-engines.test>";

async function tempDir(): Promise<string> {
  return mkdtemp(path.join(os.tmpdir(), "benchside-mail-fake-"));
}

describe("mail fake with the resend SDK", () => {
  let dir: string;
  let fake: MailFake;
  let resend: Resend;

  beforeAll(async () => {
    dir = await tempDir();
    fake = await createMailFake({ port: 0, dir });
    resend = new Resend("re_test_key", { baseUrl: fake.url });
  });

  afterAll(async () => {
    await fake?.close();
    if (dir) await rm(dir, { recursive: true, force: true });
  });

  it("refuses requests addressed to another host name (DNS rebinding)", async () => {
    const status = await new Promise<number>((resolve, reject) => {
      const req = http.request({ host: "127.0.0.1", port: fake.port, path: "/_fake/messages", headers: { host: `attacker.test:${fake.port}` } }, (res) => {
        res.resume();
        resolve(res.statusCode ?? 0);
      });
      req.on("error", reject);
      req.end();
    });
    expect(status).toBe(403);
    expect((await fetch(`${fake.url}/_fake/messages`)).status).toBe(200);
  });

  it("listens on a random loopback port when asked for port 0", () => {
    expect(fake.port).toBeGreaterThan(0);
    expect(fake.url).toBe(`http://127.0.0.1:${fake.port}`);
  });

  it("stores a sent e-mail with its links and custom headers", async () => {
    const to = "rider-one@example.test";
    const { data, error } = await resend.emails.send({
      from: FROM,
      to,
      replyTo: "desk@ridgeway-engines.test",
      subject: "Your quote for job 17 is ready",
      html:
        '<p>Hello</p><a href="https://app.benchside.test/approve?job=17&amp;t=abc">Approve</a> ' +
        "<a href='https://app.benchside.test/unsubscribe/xyz'>Unsubscribe</a> " +
        '<a href="mailto:desk@ridgeway-engines.test">Mail us</a> <a href="/relative">Relative</a>',
      text: "Approve: https://app.benchside.test/approve?job=17&t=abc\nHelp: https://help.benchside.test/quotes.",
      headers: { "List-Unsubscribe": "<https://app.benchside.test/unsubscribe/xyz>" },
      tags: [{ name: "kind", value: "quote_ready" }],
    });
    expect(error).toBeNull();
    expect(data?.id).toMatch(UUID);

    // Recipient matching is case-insensitive.
    const mail = await waitForMail({ baseUrl: fake.url, to: "RIDER-ONE@example.test", subjectIncludes: "job 17" });
    expect(mail.id).toBe(data?.id);
    expect(mail.to).toEqual([to]);
    expect(mail.reply_to).toEqual(["desk@ridgeway-engines.test"]);
    expect(mail.links).toEqual([
      "https://app.benchside.test/approve?job=17&t=abc",
      "https://app.benchside.test/unsubscribe/xyz",
      "https://help.benchside.test/quotes",
    ]);
    expect(mail.headers).toEqual({ "List-Unsubscribe": "<https://app.benchside.test/unsubscribe/xyz>" });
    expect(mail.tags).toEqual([{ name: "kind", value: "quote_ready" }]);
    expect(await readdir(dir)).toContain(`${mail.id}.json`);
  });

  it("returns a stored e-mail from emails.get in Resend's shape, and not_found for unknown ids", async () => {
    const sent = await resend.emails.send({
      from: FROM,
      to: ["rider-two@example.test"],
      bcc: "records@ridgeway-engines.test",
      subject: "Pick-up reminder",
      html: "<p>Your mower is ready.</p>",
      text: "Your mower is ready.",
    });
    const id = sent.data?.id ?? "";
    const { data, error } = await resend.emails.get(id);
    expect(error).toBeNull();
    expect(data).toMatchObject({
      object: "email",
      id,
      to: ["rider-two@example.test"],
      from: FROM,
      subject: "Pick-up reminder",
      html: "<p>Your mower is ready.</p>",
      text: "Your mower is ready.",
      bcc: ["records@ridgeway-engines.test"],
      cc: null,
      reply_to: null,
      last_event: "delivered",
    });
    expect(Number.isNaN(Date.parse(data?.created_at ?? ""))).toBe(false);

    const missing = await resend.emails.get("00000000-0000-4000-8000-000000000000");
    expect(missing.data).toBeNull();
    expect(missing.error).toMatchObject({ statusCode: 404, name: "not_found" });
  });

  it("pages through e-mails newest first with emails.list", async () => {
    const all = (await listMail(fake.url)).map((m) => m.id);
    expect(all.length).toBeGreaterThanOrEqual(2);
    const first = await resend.emails.list({ limit: 1 });
    expect(first.error).toBeNull();
    expect(first.data?.object).toBe("list");
    expect(first.data?.data.map((item) => item.id)).toEqual(all.slice(0, 1));
    expect(first.data?.has_more).toBe(true);
    const rest = await resend.emails.list({ limit: 100, after: all[0] ?? "" });
    expect(rest.data?.data.map((item) => item.id)).toEqual(all.slice(1));
    expect(rest.data?.has_more).toBe(false);
  });

  it("accepts a batch of three and stores each message", async () => {
    const to = "batch-rider@example.test";
    const subjects = ["Batch one", "Batch two", "Batch three"];
    const { data, error } = await resend.batch.send(subjects.map((subject) => ({ from: FROM, to, subject, text: `${subject} body` })));
    expect(error).toBeNull();
    const ids = data?.data.map((item) => item.id) ?? [];
    expect(ids).toHaveLength(3);
    expect(new Set(ids).size).toBe(3);
    const stored = await Promise.all(ids.map((id) => getMail(fake.url, id)));
    expect(stored.map((m) => m.subject)).toEqual(subjects);
  });

  it("stores one message for a repeated idempotency key and rejects the key with another body", async () => {
    const to = "idem-rider@example.test";
    const payload = { from: FROM, to, subject: "Invoice 88", text: "Total due: 120.00" };
    const first = await resend.emails.send(payload, { idempotencyKey: "invoice/88" });
    const second = await resend.emails.send(payload, { idempotencyKey: "invoice/88" });
    expect(first.error).toBeNull();
    expect(second.data?.id).toBe(first.data?.id);
    expect(await listMail(fake.url, { to })).toHaveLength(1);

    const changed = await resend.emails.send({ ...payload, text: "Total due: 999.00" }, { idempotencyKey: "invoice/88" });
    expect(changed.data).toBeNull();
    expect(changed.error).toMatchObject({ statusCode: 409, name: "invalid_idempotent_request" });
    const stored = await listMail(fake.url, { to });
    expect(stored.map((m) => [m.text, m.idempotency_key])).toEqual([["Total due: 120.00", "invoice/88"]]);
  });

  it("answers a missing subject with a 422 error result instead of throwing", async () => {
    const to = "no-subject@example.test";
    // Cast on purpose: the SDK's types forbid this, but app code built from runtime data could still send it.
    const invalid = { from: FROM, to, html: "<p>hi</p>" } as unknown as CreateEmailOptions;
    const { data, error } = await resend.emails.send(invalid);
    expect(data).toBeNull();
    expect(error).toMatchObject({ statusCode: 422, name: "missing_required_field" });
    expect(error?.message).toContain("subject");
    expect(await listMail(fake.url, { to })).toEqual([]);
  });

  it("fails exactly the next three sends with 429 after failNext(3, 429)", async () => {
    const to = "rate-limited@example.test";
    const before = await mailStats(fake.url);
    await failNext(fake.url, 3, 429);
    for (let attempt = 1; attempt <= 3; attempt++) {
      const result = await resend.emails.send({ from: FROM, to, subject: `Attempt ${attempt}`, text: "retry me" });
      expect(result.data).toBeNull();
      expect(result.error).toMatchObject({ statusCode: 429, name: "rate_limit_exceeded" });
      expect(result.headers?.["retry-after"]).toBe("1");
    }
    const fourth = await resend.emails.send({ from: FROM, to, subject: "Attempt 4", text: "retry me" });
    expect(fourth.error).toBeNull();
    expect((await listMail(fake.url, { to })).map((m) => m.subject)).toEqual(["Attempt 4"]);
    const after = await mailStats(fake.url);
    expect(after.failed - before.failed).toBe(3);
    expect(after.accepted - before.accepted).toBe(1);
    expect(after.pendingFailures).toBe(0);
  });

  it("requires a bearer key starting with re_ when none is configured", async () => {
    const noKey = await fetch(`${fake.url}/emails`, { method: "POST", body: "{}" });
    expect(noKey.status).toBe(401);
    expect(await noKey.json()).toMatchObject({ statusCode: 401, name: "missing_api_key" });

    const wrongPrefix = await new Resend("sk_not_resend", { baseUrl: fake.url }).emails.send({ from: FROM, to: "x@example.test", subject: "s", text: "t" });
    expect(wrongPrefix.error).toMatchObject({ statusCode: 403, name: "invalid_api_key" });
  });

  it("answers an over-sized body with 413", async () => {
    const res = await fetch(`${fake.url}/emails`, {
      method: "POST",
      headers: { authorization: "Bearer re_test_key", "content-type": "application/json" },
      body: JSON.stringify({ from: FROM, to: "big@example.test", subject: "big", text: "x".repeat(11 * 1024 * 1024) }),
    });
    expect(res.status).toBe(413);
    expect(await listMail(fake.url, { to: "big@example.test" })).toEqual([]);
  });

  it("escapes a <script> subject and body on the mailbox pages", async () => {
    const { data } = await resend.emails.send({
      from: FROM,
      to: "xss@example.test",
      subject: '<script>alert("x")</script> Quote',
      html: '<p>hi</p><script>document.title = "owned"</script>',
    });
    const index = await fetch(`${fake.url}/`);
    const indexHtml = await index.text();
    expect(index.headers.get("content-security-policy")).toContain("default-src 'none'");
    expect(indexHtml).toContain("<title>Benchside mail fake</title>");
    expect(indexHtml).toContain("&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; Quote");
    expect(indexHtml).not.toMatch(/<script/i);

    const page = await (await fetch(`${fake.url}/m/${data?.id ?? ""}`)).text();
    expect(page).not.toMatch(/<script/i);
    expect(page).toContain('<iframe sandbox title="HTML part" srcdoc="&lt;p&gt;hi&lt;/p&gt;&lt;script&gt;document.title = &quot;owned&quot;&lt;/script&gt;"></iframe>');
  });

  it("waitForMail names the address when nothing arrives", async () => {
    await expect(waitForMail({ baseUrl: fake.url, to: "nobody@example.test", timeoutMs: 300 })).rejects.toThrow(/nobody@example\.test/);
  });
});

describe("mail fake configuration and persistence", () => {
  it("enforces a configured API key", async () => {
    const dir = await tempDir();
    const fake = await createMailFake({ port: 0, dir, apiKey: "re_configured" });
    try {
      const message = { from: FROM, to: "keyed@example.test", subject: "Key check", text: "hello" };
      const wrong = await new Resend("re_other", { baseUrl: fake.url }).emails.send(message);
      expect(wrong.error).toMatchObject({ statusCode: 403, name: "invalid_api_key" });
      const right = await new Resend("re_configured", { baseUrl: fake.url }).emails.send(message);
      expect(right.error).toBeNull();
      expect((await listMail(fake.url)).map((m) => m.id)).toEqual([right.data?.id]);
    } finally {
      await fake.close();
      await rm(dir, { recursive: true, force: true });
    }
  });

  it("returns an error result, not an exception, when the fake is down", async () => {
    const dir = await tempDir();
    const fake = await createMailFake({ port: 0, dir });
    await fake.close();
    await rm(dir, { recursive: true, force: true });
    const result = await new Resend("re_test_key", { baseUrl: fake.url }).emails.send({ from: FROM, to: "down@example.test", subject: "s", text: "t" });
    expect(result.data).toBeNull();
    expect(result.error).toMatchObject({ statusCode: null, name: "application_error" });
  });

  it("keeps the mailbox and idempotency keys across a restart, and clears both on request", async () => {
    const dir = await tempDir();
    const to = "restart@example.test";
    const payload = { from: FROM, to, subject: "Before restart B", text: "b" };
    const first = await createMailFake({ port: 0, dir });
    let sentIds: string[];
    try {
      const resend = new Resend("re_test_key", { baseUrl: first.url });
      const a = await resend.emails.send({ from: FROM, to, subject: "Before restart A", text: "a" });
      const b = await resend.emails.send(payload, { idempotencyKey: "restart/b" });
      sentIds = [b.data?.id ?? "", a.data?.id ?? ""];
    } finally {
      await first.close();
    }

    const second = await createMailFake({ port: 0, dir });
    try {
      expect((await listMail(second.url, { to })).map((m) => m.id)).toEqual(sentIds);
      const resend = new Resend("re_test_key", { baseUrl: second.url });
      const fetched = await resend.emails.get(sentIds[1] ?? "");
      expect(fetched.data?.subject).toBe("Before restart A");
      const replay = await resend.emails.send(payload, { idempotencyKey: "restart/b" });
      expect(replay.data?.id).toBe(sentIds[0]);
      expect(await listMail(second.url, { to })).toHaveLength(2);

      await clearMailbox(second.url);
      expect(await listMail(second.url)).toEqual([]);
      expect((await readdir(dir)).filter((name) => name.endsWith(".json"))).toEqual([]);
    } finally {
      await second.close();
      await rm(dir, { recursive: true, force: true });
    }
  });
});
