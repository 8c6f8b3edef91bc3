// /_fake/* routes: the shared switches (fail, drop webhooks, delivery log, reset) plus how the next
// messages end, answers lost after a message was accepted, the messages as JSON and a tester's reply
// as the owner. No auth, because the server only answers loopback clients.
import { failureCount, handleSwitchboard, parseJsonObject, type Switchboard } from "../shared/control";
import type { JsonResponse } from "../shared/http";
import type { SmsContext } from "./api";
import { badSwitch, notFound } from "./errors";
import { newSid, rfc2822 } from "./store";
import type { Outcome, StoredMessage } from "./types";

const OUTCOMES: Outcome[] = ["delivered", "failed", "undelivered"];
const E164 = /^\+[1-9]\d{6,14}$/;

/** A text from `from` (the owner's phone) to `to` (the shop's number), stored and sent to the app's incoming webhook. */
export function receiveText(ctx: SmsContext, input: { from: string; to: string; body: string }): StoredMessage {
  if (!E164.test(input.from) || !E164.test(input.to)) throw badSwitch("from and to must be E.164 numbers such as +15551230000.");
  if (!input.body.trim() || input.body.length > 1600) throw badSwitch("body must be 1 to 1600 characters.");
  const now = Date.now();
  const sid = newSid("SM");
  const message: StoredMessage = {
    sid,
    account_sid: ctx.accountSid,
    api_version: "2010-04-01",
    body: input.body,
    date_created: rfc2822(now),
    date_sent: rfc2822(now),
    date_updated: rfc2822(now),
    direction: "inbound",
    error_code: null,
    error_message: null,
    from: input.from,
    messaging_service_sid: null,
    num_media: "0",
    num_segments: "1",
    price: null,
    price_unit: "USD",
    status: "received",
    subresource_uris: {},
    to: input.to,
    uri: `/2010-04-01/Accounts/${ctx.accountSid}/Messages/${sid}.json`,
    status_callback: null,
    created_ms: now,
  };
  ctx.store.messages.set(sid, message);
  ctx.webhooks.inbound(message);
  void ctx.store.save();
  return message;
}

const BOARD: Switchboard<SmsContext> = {
  invalid: badSwitch,
  notFound,
  counts: ({ store }) => ({ messages: store.messages.size }),
  switches: (ctx) => ({ next_outcomes: ctx.outcomes, lose_answers: ctx.loseAnswers }),
  routes: (ctx, status) => ({
    "POST /_fake/outcome": ({ body }) => {
      const input = parseJsonObject(body, '{"outcome": "undelivered", "count": 1}', badSwitch);
      if (!OUTCOMES.includes(input.outcome as Outcome)) throw badSwitch(`outcome must be one of ${OUTCOMES.join(", ")}.`);
      ctx.outcomes = Array.from({ length: failureCount(input.count, badSwitch) }, () => input.outcome as Outcome);
      return status();
    },
    "POST /_fake/lose-answers": ({ body }) => {
      ctx.loseAnswers = failureCount(parseJsonObject(body, '{"count": 1}', badSwitch).count, badSwitch);
      return status();
    },
    "GET /_fake/messages": ({ query }) => {
      const to = query.get("to");
      const from = query.get("from");
      const data = ctx.store.list().filter((m) => (!to || m.to === to) && (!from || m.from === from));
      return { status: 200, body: { data } };
    },
    "POST /_fake/inbound": ({ body }) => {
      const input = parseJsonObject(body, '{"from": "+15551230000", "to": "+15559870000", "body": "STOP"}', badSwitch);
      const [from, to, text] = [input.from, input.to, input.body];
      if (typeof from !== "string" || typeof to !== "string" || typeof text !== "string") throw badSwitch("from, to and body must be strings.");
      return { status: 201, body: receiveText(ctx, { from, to, body: text }) };
    },
    "POST /_fake/webhooks/redeliver": ({ body }) => {
      const id = parseJsonObject(body, '{"id": "WH…"}', badSwitch).id;
      const delivery = ctx.webhooks.find(id);
      if (!delivery) throw notFound(`No delivery ${String(id)}.`);
      ctx.webhooks.redeliver(delivery);
      return { status: 200, body: { id: delivery.id, state: delivery.state } };
    },
  }),
  reset: (ctx, everything) => {
    ctx.outcomes = [];
    ctx.loseAnswers = 0;
    if (everything) {
      for (const timer of ctx.timers) clearTimeout(timer);
      ctx.timers.clear();
    }
  },
};

export function handleControl(method: string, pathname: string, query: URLSearchParams, body: Buffer, ctx: SmsContext): Promise<JsonResponse> {
  return handleSwitchboard(ctx, BOARD, { method, pathname, query, body });
}
