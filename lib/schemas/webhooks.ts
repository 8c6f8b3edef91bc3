import { z } from "zod";

// The events the payments and video services send us, as far as we use them. A delivery with a
// good signature is from the service; one we can't use (wrong shape, an event type we don't
// handle) is acknowledged and logged rather than refused, since a service retries anything but a
// 2xx for days. Shapes follow the SDKs' own types (stripe: Event, Checkout.Session, Charge;
// @mux/mux-node: webhooks UnwrapWebhookEvent), trimmed to the fields we read; the rest passes.

/** Webhook bodies are small JSON documents; anything bigger is refused while it is read. */
export const WEBHOOK_MAX_BYTES = 1024 * 1024;

const id = z.string().min(1).max(255);
/** Provider ids we also keep as a payment's reference (120 characters). */
const ref = z.string().min(1).max(120);
const expandable = z.union([ref, z.object({ id: ref }).loose()]).nullish();
/** Video ids are kept in 64-character columns. */
const videoId = z.string().min(1).max(64);

// ---------------------------------------------------------------- payments (stripe-shaped)

// Event ids and types are stored (payment_webhook_events: id 255, type 64; video_webhook_events: 64, 64).
export const paymentEventSchema = z
  .object({
    id,
    type: z.string().min(1).max(64),
    data: z.object({ object: z.object({}).loose() }).loose(),
  })
  .loose();

export const checkoutSessionSchema = z
  .object({
    id,
    payment_status: z.string().nullish(),
    status: z.string().nullish(),
    amount_total: z.number().int().nonnegative().nullish(),
    currency: z.string().min(3).max(3).nullish(),
    payment_intent: expandable,
  })
  .loose();

export const chargeSchema = z
  .object({
    id: ref,
    payment_intent: expandable,
    amount_refunded: z.number().int().nonnegative(),
    refunds: z
      .object({
        data: z.array(z.object({ id: ref, amount: z.number().int().nonnegative(), payment_intent: expandable }).loose()).optional(),
      })
      .loose()
      .nullish(),
  })
  .loose();

/** A payment attempt that failed (stripe: PaymentIntent): what it was for (our metadata) and why. */
export const paymentIntentSchema = z
  .object({
    id: ref,
    amount: z.number().int().nonnegative(),
    currency: z.string().min(3).max(3),
    metadata: z.record(z.string(), z.string()).nullish(),
    last_payment_error: z
      .object({ message: z.string().max(1000).nullish(), code: z.string().max(100).nullish(), decline_code: z.string().max(100).nullish() })
      .loose()
      .nullish(),
  })
  .loose();

/** The payment events we act on and the shape of what each carries. */
export const PAYMENT_EVENT_OBJECTS = {
  "checkout.session.completed": checkoutSessionSchema,
  "checkout.session.async_payment_succeeded": checkoutSessionSchema,
  "checkout.session.async_payment_failed": checkoutSessionSchema,
  "checkout.session.expired": checkoutSessionSchema,
  "charge.refunded": chargeSchema,
  "payment_intent.payment_failed": paymentIntentSchema,
} as const;

// ---------------------------------------------------------------- video (mux-shaped)

export const videoEventSchema = z
  .object({
    id: videoId,
    type: z.string().min(1).max(64),
    data: z
      .object({
        id: videoId.optional(),
        upload_id: videoId.optional(),
        asset_id: videoId.optional(),
        status: z.string().max(40).optional(),
        duration: z.number().nonnegative().finite().optional(),
        aspect_ratio: z.string().max(16).optional(),
        playback_ids: z.array(z.object({ id: videoId, policy: z.string().max(20).optional() }).loose()).max(50).optional(),
        errors: z.object({ type: z.string().max(100).optional(), messages: z.array(z.string().max(2000)).max(20).optional() }).loose().optional(),
        error: z.object({ type: z.string().max(100).optional(), message: z.string().max(2000).optional() }).loose().optional(),
      })
      .loose(),
  })
  .loose();

export type VideoEventBody = z.infer<typeof videoEventSchema>;

/** The first problem of a failed parse, for the log line. */
export function firstIssue(error: z.ZodError): string {
  const issue = error.issues[0];
  return issue ? `${issue.path.join(".") || "(body)"}: ${issue.message}` : "invalid";
}
