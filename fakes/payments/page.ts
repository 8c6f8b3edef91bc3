// The hosted-style payment page at a session's `url`: what is being paid, one card number field, Pay
// and Cancel. Plain, accessible and clearly a local test page (our own look). Every value shown is
// escaped: names and URLs come from the caller.
import cc from "currency-codes";
import { escapeHtml, htmlPage } from "../shared/html";
import { expireIfDue, type FakeContext, payWithCard } from "./ledger";
import type { PaymentError, StoredSession } from "./types";

export type HtmlResponse = { status: number; html: string; csp: string } | { status: 303; location: string };

/** Display only; the amount itself is never re-derived from this text. */
function money(minor: number, currency: string): string {
  const digits = cc.code(currency.toUpperCase())?.digits ?? 2;
  const text = (minor / 10 ** digits).toFixed(digits);
  return new Intl.NumberFormat("en-US", { style: "currency", currency: currency.toUpperCase(), minimumFractionDigits: digits, maximumFractionDigits: digits }).format(text as `${number}`);
}

const STYLE = `
  :root { color-scheme: light; }
  body { margin: 0; background: #F5F2EC; color: #1E1B17; font: 17px/1.5 system-ui, -apple-system, "Segoe UI", sans-serif; }
  .test { background: #FBE6C8; border-bottom: 2px solid #8F4F00; padding: 8px 16px; font-size: 15px; }
  main { max-width: 30rem; margin: 24px auto; padding: 0 16px; }
  .card { background: #FFFDF9; border: 1px solid #D8D1C5; border-radius: 12px; padding: 20px; }
  h1 { font-size: 24px; margin: 0 0 4px; }
  table { width: 100%; border-collapse: collapse; margin: 12px 0; }
  td { padding: 6px 0; border-bottom: 1px solid #D8D1C5; vertical-align: top; }
  td.amount { text-align: right; white-space: nowrap; padding-left: 12px; }
  tr.total td { font-weight: 700; border-bottom: none; }
  label { display: block; font-weight: 600; margin-top: 16px; }
  input { box-sizing: border-box; width: 100%; min-height: 48px; font-size: 18px; padding: 8px 12px; border: 2px solid #595249; border-radius: 8px; letter-spacing: 0.05em; }
  input:focus, button:focus { outline: 3px solid #0D5257; outline-offset: 2px; }
  .hint { color: #595249; font-size: 15px; margin: 4px 0 0; }
  .hint code { font-size: 15px; }
  button { min-height: 48px; font-size: 17px; font-weight: 700; border-radius: 8px; padding: 10px 20px; cursor: pointer; }
  .pay { background: #0D5257; color: #fff; border: none; width: 100%; margin-top: 16px; }
  .cancel { background: transparent; color: #0D5257; border: 2px solid #0D5257; width: 100%; margin-top: 12px; }
  .problem { background: #F7DCD6; border-left: 4px solid #9C2F1C; padding: 10px 12px; margin-top: 16px; border-radius: 6px; }
  .muted { color: #595249; }
`;

const BANNER = '<p class="test" role="note"><strong>Local test payments.</strong> No real card is charged; this page runs on this computer only.</p>';

const layout = (title: string, main: string): string => htmlPage({ title, style: STYLE, banner: BANNER, main });

const origin = (url: string | null) => (url && URL.canParse(url) ? new URL(url).origin : "");

/** Scripts never run; the form may post here and then be redirected to the session's own return addresses. */
function csp(s: StoredSession): string {
  const targets = ["'self'", origin(s.success_url), origin(s.cancel_url)].filter(Boolean).join(" ");
  return `default-src 'none'; style-src 'unsafe-inline'; base-uri 'none'; form-action ${targets}`;
}

function paymentPage(s: StoredSession, problem: PaymentError | null): string {
  const rows = s.line_items
    .map((i) => `<tr><td>${escapeHtml(i.name)}${i.quantity > 1 ? ` × ${i.quantity}` : ""}</td><td class="amount">${money(i.unit_amount * i.quantity, i.currency)}</td></tr>`)
    .join("\n");
  const total = money(s.amount_total, s.currency);
  return layout(
    `Pay ${total}`,
    `<div class="card">
<h1>Pay ${total}</h1>
<table aria-label="What you are paying for"><tbody>
${rows}
<tr class="total"><td>Total</td><td class="amount">${total}</td></tr>
</tbody></table>
<form method="post" action="/pay/${encodeURIComponent(s.id)}">
${problem ? `<div class="problem" role="alert" id="card-problem"><strong>Not paid.</strong> ${escapeHtml(problem.message)} <span class="muted">(${escapeHtml(problem.decline_code ?? problem.code)})</span></div>` : ""}
<label for="card">Card number</label>
<input id="card" name="card" inputmode="numeric" autocomplete="cc-number" required pattern="[0-9 \\-]{12,23}" aria-describedby="card-hint${problem ? " card-problem" : ""}"${problem ? ' aria-invalid="true"' : ""}>
<p class="hint" id="card-hint">Test numbers: <code>4242 4242 4242 4242</code> is paid; <code>4000 0000 0000 0002</code> is declined.</p>
<button class="pay" type="submit" name="action" value="pay">Pay ${total}</button>
${s.cancel_url ? '<button class="cancel" type="submit" name="action" value="cancel" formnovalidate>Cancel and go back</button>' : ""}
</form>
</div>`,
  );
}

function closedPage(s: StoredSession | undefined): string {
  const why = !s ? "There is no payment with this address." : s.status === "expired" ? "This payment page has expired. Go back and start the payment again." : "This payment is already complete.";
  return layout("Payment page closed", `<div class="card"><h1>Nothing to pay here</h1><p>${why}</p></div>`);
}

const PLAIN_CSP = "default-src 'none'; style-src 'unsafe-inline'; base-uri 'none'; form-action 'none'";

export function showPayPage(ctx: FakeContext, id: string): HtmlResponse {
  const s = ctx.store.sessions.get(id);
  if (s) expireIfDue(ctx, s);
  if (!s || s.status !== "open") return { status: s ? 410 : 404, html: closedPage(s), csp: PLAIN_CSP };
  return { status: 200, html: paymentPage(s, null), csp: csp(s) };
}

/** The form posted: try the card, or go back to the caller's cancel address (the session stays open). */
export function submitPayPage(ctx: FakeContext, id: string, body: string): HtmlResponse {
  const s = ctx.store.sessions.get(id);
  if (s) expireIfDue(ctx, s);
  if (s?.status === "complete") return { status: 303, location: s.success_url.replaceAll("{CHECKOUT_SESSION_ID}", s.id) };
  if (!s || s.status !== "open") return { status: s ? 410 : 404, html: closedPage(s), csp: PLAIN_CSP };
  const form = new URLSearchParams(body);
  if (form.get("action") === "cancel" && s.cancel_url) return { status: 303, location: s.cancel_url };
  const result = payWithCard(ctx, s, form.get("card") ?? "");
  if (result.ok) return { status: 303, location: result.redirect };
  return { status: 402, html: paymentPage(s, result.error), csp: csp(s) };
}
