import "server-only";
import Stripe from "stripe";
import { AppError } from "@/lib/errors";

// The only place that picks where payments go: STRIPE_API_HOST / PORT / PROTOCOL point the official
// SDK at the local fake (fakes/payments); unset, it talks to the hosted API, so real keys work by
// configuration alone.
let client: { key: string; stripe: Stripe } | undefined;

export function stripe(): Stripe {
  const key = process.env.STRIPE_SECRET_KEY;
  if (!key) throw new AppError("unavailable", "Online payments are not configured (STRIPE_SECRET_KEY).");
  if (client?.key !== key) {
    const env = process.env;
    const port = env.STRIPE_API_PORT ? Number(env.STRIPE_API_PORT) : undefined;
    client = {
      key,
      stripe: new Stripe(key, {
        ...(env.STRIPE_API_HOST ? { host: env.STRIPE_API_HOST } : {}),
        ...(port ? { port } : {}),
        ...(env.STRIPE_API_PROTOCOL === "http" || env.STRIPE_API_PROTOCOL === "https" ? { protocol: env.STRIPE_API_PROTOCOL } : {}),
        // Our calls carry idempotency keys, so the SDK's own retries can't charge or refund twice.
        maxNetworkRetries: Number(env.STRIPE_MAX_RETRIES ?? 1),
        timeout: 20_000,
      }),
    };
  }
  return client.stripe;
}

/** The provider's answer as a clear AppError: card and request problems say what was wrong; the rest is "try again". */
export function paymentsError(error: unknown, doing: string): AppError {
  if (error instanceof AppError) return error;
  if (error instanceof Stripe.errors.StripeInvalidRequestError || error instanceof Stripe.errors.StripeCardError) {
    return new AppError("conflict", `The payments service refused ${doing}: ${error.message}`);
  }
  console.error(error);
  return new AppError("unavailable", `The payments service didn't answer while ${doing}. Nothing was changed; try again in a moment.`);
}

/**
 * Verifies a webhook delivery on its raw body (a missing, wrong, altered or stale signature is a
 * 401) and parses it. What it holds is checked by the caller: a signed body that isn't JSON comes
 * back as `undefined`, to be acknowledged and ignored rather than retried by the service forever.
 */
export function verifyWebhook(rawBody: string, signature: string | null): unknown {
  const secret = process.env.STRIPE_WEBHOOK_SECRET;
  if (!secret) throw new AppError("unavailable", "Payment webhooks are not configured (STRIPE_WEBHOOK_SECRET).");
  try {
    // 300 s tolerance (the SDK's default): an old delivery replayed later is refused.
    // `signature` is always set by the SDK's module (its type allows null before set-up).
    Stripe.webhooks.signature!.verifyHeader(rawBody, signature ?? "", secret);
  } catch {
    throw new AppError("unauthenticated", "The webhook signature is missing, wrong or too old.");
  }
  try {
    return JSON.parse(rawBody) as unknown;
  } catch {
    return undefined;
  }
}
