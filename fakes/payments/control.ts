// /_fake/* routes: the shared switches (fail, drop webhooks, delivery log, reset) plus redelivery of an
// event and the sessions with their line items. No auth, because the server only answers loopback clients.
import { handleSwitchboard, parseJsonObject, type Switchboard } from "../shared/control";
import type { JsonResponse } from "../shared/http";
import { invalidRequest, PaymentsApiError } from "./errors";
import { type FakeContext, publicSession } from "./ledger";

const BOARD: Switchboard<FakeContext> = {
  invalid: invalidRequest,
  notFound: (message) => new PaymentsApiError(404, "invalid_request_error", message),
  counts: ({ store }) => ({ sessions: store.sessions.size, payment_intents: store.intents.size, refunds: store.refunds.size }),
  routes: (ctx) => ({
    "POST /_fake/webhooks/redeliver": ({ body }) => {
      const eventId = parseJsonObject(body, '{"event_id": "evt_…"}', invalidRequest).event_id;
      const delivery = ctx.webhooks.find(eventId);
      if (!delivery) throw new PaymentsApiError(404, "invalid_request_error", `No delivery of event ${String(eventId)}.`);
      ctx.webhooks.redeliver(delivery);
      return { status: 200, body: { event_id: delivery.event.id, state: delivery.state } };
    },
    "GET /_fake/sessions": () => ({
      status: 200,
      body: { data: [...ctx.store.sessions.values()].map((s) => ({ ...publicSession(s), line_items: s.line_items })) },
    }),
  }),
};

export function handleControl(method: string, pathname: string, query: URLSearchParams, body: Buffer, ctx: FakeContext): Promise<JsonResponse> {
  return handleSwitchboard(ctx, BOARD, { method, pathname, query, body });
}
