// The SMS fake on its own: the hosted API's auth, paths and error envelope as the twilio SDK sees them,
// the tester's page (escaped) and its reply form, which becomes a signed inbound webhook.
import { mkdtemp, rm } from "node:fs/promises";
import http from "node:http";
import os from "node:os";
import path from "node:path";
import twilio from "twilio";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createSmsFake, type SmsFake } from "../../fakes/sms/server";
import { segmentCount } from "../../fakes/sms/api";

const SID = `AC${"1f".repeat(16)}`;
const TOKEN = "sms-fake-own-test-token";

describe("the SMS fake", () => {
  let dir: string;
  let fake: SmsFake;
  let hook: http.Server;
  const received: { signature: string; url: string; params: Record<string, string> }[] = [];
  const client = (token = TOKEN) =>
    twilio(SID, token, {
      httpClient: new (class extends twilio.RequestClient {
        override request<T>(o: Parameters<twilio.RequestClient["request"]>[0]) {
          return super.request<T>({ ...o, uri: o.uri.replace("https://api.twilio.com", fake.url) } as never);
        }
      })(),
    });

  beforeAll(async () => {
    dir = await mkdtemp(path.join(os.tmpdir(), "sms-fake-own-"));
    hook = http.createServer((req, res) => {
      let body = "";
      req.on("data", (c: Buffer) => (body += c.toString("utf8")));
      req.on("end", () => {
        received.push({ signature: String(req.headers["x-twilio-signature"]), url: `http://127.0.0.1:${(hook.address() as { port: number }).port}${req.url}`, params: Object.fromEntries(new URLSearchParams(body)) });
        res.writeHead(200, { "content-type": "text/xml" }).end("<Response/>");
      });
    });
    await new Promise<void>((r) => hook.listen(0, "127.0.0.1", r));
    fake = await createSmsFake({ port: 0, dir, accountSid: SID, authToken: TOKEN, stepMs: 10, inboundUrl: `http://127.0.0.1:${(hook.address() as { port: number }).port}/in` });
  });

  afterAll(async () => {
    await fake?.close();
    await new Promise<void>((r) => hook.close(() => r()));
    await rm(dir, { recursive: true, force: true });
  });

  it("refuses a wrong token and another account, in the API's error envelope", async () => {
    await expect(client("wrong").messages.create({ to: "+15550100001", from: "+15550100999", body: "x" })).rejects.toMatchObject({ status: 401, code: 20003 });
    const other = await fetch(`${fake.url}/2010-04-01/Accounts/AC${"0".repeat(32)}/Messages.json`, { headers: { authorization: `Basic ${Buffer.from(`${SID}:${TOKEN}`).toString("base64")}` } });
    expect(other.status).toBe(403);
    expect(await other.json()).toEqual({ code: 20003, message: expect.any(String), more_info: "https://www.twilio.com/docs/errors/20003", status: 403 });
    await expect(client().messages.create({ to: "+15550100001", from: "+15550100999", body: " " })).rejects.toMatchObject({ status: 400, code: 21602 });
  });

  it("creates, fetches and lists messages as the SDK reads them", async () => {
    const created = await client().messages.create({ to: "+15550100001", from: "+15550100999", body: "Hello <b>owner</b>" });
    expect(created).toMatchObject({ status: "queued", direction: "outbound-api", numSegments: "1", accountSid: SID });
    expect(created.sid).toMatch(/^SM[0-9a-f]{32}$/);
    await new Promise((r) => setTimeout(r, 60));
    expect((await client().messages(created.sid).fetch()).status).toBe("delivered");
    expect((await client().messages.list({ to: "+15550100001" })).map((m) => m.sid)).toContain(created.sid);
  });

  it("counts segments as carriers do", () => {
    // 3GPP TS 23.038/23.040: 160 GSM-7 septets in one, 153 per part after; 70 UCS-2 units, 67 per part.
    expect(segmentCount("a".repeat(160))).toBe(1);
    expect(segmentCount("a".repeat(161))).toBe(2);
    expect(segmentCount("€".repeat(80))).toBe(1);
    expect(segmentCount("é".repeat(161))).toBe(2);
    expect(segmentCount("ą".repeat(70))).toBe(1);
    expect(segmentCount("ą".repeat(71))).toBe(2);
  });

  it("shows texts escaped on its page and turns a tester's reply into a signed inbound webhook", async () => {
    const page = await (await fetch(`${fake.url}/`)).text();
    expect(page).toContain("Hello &lt;b&gt;owner&lt;/b&gt;");
    expect(page).not.toContain("<b>owner</b>");
    const reply = await fetch(`${fake.url}/reply`, { method: "POST", redirect: "manual", headers: { "content-type": "application/x-www-form-urlencoded" }, body: new URLSearchParams({ from: "+15550100001", to: "+15550100999", body: "HELP" }).toString() });
    expect(reply.status).toBe(303);
    await new Promise((r) => setTimeout(r, 200));
    const inbound = received.find((r) => r.params.Body === "HELP")!;
    expect(inbound.params).toMatchObject({ From: "+15550100001", To: "+15550100999", SmsStatus: "received", AccountSid: SID });
    expect(twilio.validateRequest(TOKEN, inbound.signature, inbound.url, inbound.params)).toBe(true);
    expect(twilio.validateRequest(TOKEN, inbound.signature, inbound.url, { ...inbound.params, Body: "STOP" })).toBe(false);
  });
});
