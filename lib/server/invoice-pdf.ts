import "server-only";
import PDFDocument from "pdfkit";
import { LINE_KIND_LABEL, METHOD_LABEL } from "@/lib/approvals";
import { INVOICE_STATUS_LABEL, LINE_SOURCE_LABEL, PAYMENT_KIND_LABEL, PAYMENT_METHOD_LABEL, withdrawnText } from "@/lib/invoices";
import { formatHours, formatMoney, formatQuantity } from "@/lib/money";
import type { InvoiceView, ViewLine } from "@/lib/server/invoice-views";

// The invoice as a PDF (pdfkit, standard Helvetica): the same content as the printable page — the
// shop, the job and machine, the lines and totals, payments, the returned-parts note and the
// authorisation record. Black on white, A4 or Letter alike (Letter: the shop's likely paper).

const LEFT = 50;
const RIGHT = 562;
const BOTTOM = 740;
const COLS = { what: LEFT, qty: 330, price: 400, amount: 482 };

/** Helvetica's encoding (WinAnsi) has no minus sign or arrows: keep to characters it can show. */
const pdfText = (s: string) => s.replace(/\u2212/g, "-").replace(/[\u2190-\u21ff]/g, "->").replace(/\u00a0|\u202f/g, " ");

function when(iso: string, timeZone: string): string {
  return new Intl.DateTimeFormat("en-US", { timeZone, dateStyle: "medium", timeStyle: "short" }).format(new Date(iso));
}

function lineCells(l: ViewLine, currency: string) {
  if (l.kind === "part") return { qty: formatQuantity(l.qtyThousandths ?? 0), price: formatMoney(l.unitPriceMinor ?? 0, currency) };
  if (l.kind === "labour") return { qty: `${formatHours(l.hoursTenths ?? 0)} h`, price: `${formatMoney(l.rateMinor ?? 0, currency)}/h` };
  return { qty: "", price: "" };
}

export async function renderInvoicePdf(view: InvoiceView): Promise<Buffer> {
  const inv = view.invoice;
  if (!inv) throw new Error("no invoice to render");
  const m = (n: number) => pdfText(formatMoney(n, inv.currency));
  const tz = view.shop.timezone;
  const doc = new PDFDocument({ size: "LETTER", margins: { top: 50, bottom: 40, left: LEFT, right: 612 - RIGHT }, info: { Title: `Invoice ${inv.label}`, Author: view.shop.name, Subject: `${view.job.label} ${view.job.machine}` } });
  const chunks: Buffer[] = [];
  doc.on("data", (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on("end", () => resolve(Buffer.concat(chunks)));
    doc.on("error", reject);
  });
  const room = (height: number) => {
    if (doc.y + height > BOTTOM) doc.addPage();
  };
  const text = (s: string, x: number, opts: PDFKit.Mixins.TextOptions = {}) => doc.text(pdfText(s), x, undefined, opts);
  const heading = (s: string) => {
    room(40);
    doc.moveDown(0.8).font("Helvetica-Bold").fontSize(13);
    text(s, LEFT);
    doc.font("Helvetica").fontSize(10).moveDown(0.2);
  };

  // Shop and invoice number.
  const top = doc.y;
  doc.font("Helvetica-Bold").fontSize(16);
  text(view.shop.name, LEFT, { width: 300 });
  doc.font("Helvetica").fontSize(10);
  for (const line of [view.shop.phone, view.shop.email].filter(Boolean) as string[]) text(line, LEFT, { width: 300 });
  const afterShop = doc.y;
  doc.y = top;
  doc.font("Helvetica-Bold").fontSize(18);
  text(`Invoice ${inv.label}`, 330, { width: RIGHT - 330, align: "right" });
  doc.font("Helvetica").fontSize(10);
  text(INVOICE_STATUS_LABEL[inv.status], 330, { width: RIGHT - 330, align: "right" });
  text(inv.issuedAt ? `Issued ${when(inv.issuedAt, tz)}` : `Drafted ${when(inv.createdAt, tz)}`, 330, { width: RIGHT - 330, align: "right" });
  doc.y = Math.max(doc.y, afterShop) + 14;

  text(`Owner: ${view.job.customerName}`, LEFT);
  text(`Job: ${view.job.label}`, LEFT);
  text(`Machine: ${view.job.machine}${view.job.serial ? ` · serial ${view.job.serial}` : ""}`, LEFT);
  doc.moveDown(1);

  // Lines.
  const header = () => {
    doc.font("Helvetica-Bold");
    const y = doc.y;
    doc.text("What", COLS.what, y, { width: 270 });
    doc.text("Qty / hours", COLS.qty, y, { width: 65, align: "right" });
    doc.text("Price", COLS.price, y, { width: 75, align: "right" });
    doc.text("Amount", COLS.amount, y, { width: RIGHT - COLS.amount, align: "right" });
    doc.moveTo(LEFT, doc.y + 2).lineTo(RIGHT, doc.y + 2).lineWidth(1).stroke();
    doc.font("Helvetica").moveDown(0.4);
  };
  header();
  for (const l of inv.lines) {
    const c = lineCells(l, inv.currency);
    const core = l.source === "core_charge" || l.source === "core_credit" ? LINE_SOURCE_LABEL[l.source].toLowerCase() : null;
    const detail = [LINE_KIND_LABEL[l.kind], l.partNumber ? `part ${l.partNumber}` : null, l.taxable ? "taxed" : null, core, l.flagged ? "OVER WHAT WAS AUTHORISED: NOT CHARGED" : null].filter(Boolean).join(" · ");
    const h = doc.heightOfString(pdfText(l.description), { width: 270 }) + doc.heightOfString(detail, { width: 270 }) + 6;
    if (doc.y + h > BOTTOM) {
      doc.addPage();
      header();
    }
    const y = doc.y;
    doc.text(pdfText(l.description), COLS.what, y, { width: 270 });
    doc.fillColor("#444444").text(pdfText(detail), COLS.what, undefined, { width: 270 }).fillColor("#000000");
    const next = doc.y;
    doc.text(pdfText(c.qty), COLS.qty, y, { width: 65, align: "right" });
    doc.text(c.price ? pdfText(c.price) : "", COLS.price, y, { width: 75, align: "right" });
    doc.text(l.flagged ? `(${m(l.grossMinor)})` : m(l.netMinor), COLS.amount, y, { width: RIGHT - COLS.amount, align: "right" });
    doc.y = next + 4;
  }
  doc.moveTo(LEFT, doc.y).lineTo(RIGHT, doc.y).lineWidth(0.5).stroke();
  doc.moveDown(0.6);

  // Totals.
  const rows: [string, string, boolean][] = [["Work and parts", m(inv.subtotalMinor), false]];
  if (inv.discountMinor) rows.push(["Discount", `-${m(inv.discountMinor)}`, false]);
  if (inv.suppliesMinor) rows.push(["Shop supplies", m(inv.suppliesMinor), false]);
  rows.push([inv.taxLabel, m(inv.taxMinor), false], ["Total", m(inv.totalMinor), true]);
  if (inv.paidMinor) rows.push(["Paid (deposits and payments, less refunds)", `-${m(inv.paidMinor)}`, false]);
  rows.push([inv.balanceMinor < 0 ? "Owed back to you" : "Balance due", m(Math.abs(inv.balanceMinor)), true]);
  room(rows.length * 16);
  for (const [label, value, strong] of rows) {
    const y = doc.y;
    doc.font(strong ? "Helvetica-Bold" : "Helvetica");
    doc.text(label, 300, y, { width: 180 });
    const after = doc.y;
    doc.text(value, COLS.amount, y, { width: RIGHT - COLS.amount, align: "right" });
    // A label that wraps is taller than its amount: carry on below whichever ends lower.
    doc.y = Math.max(after, doc.y);
  }
  doc.font("Helvetica");

  if (view.payments.length) {
    heading("Payments");
    for (const p of view.payments) {
      room(14);
      text(`${p.receipt} · ${PAYMENT_KIND_LABEL[p.kind]}${p.forPart ? ` for ${p.forPart}` : ""} · ${PAYMENT_METHOD_LABEL[p.method]}${p.reference ? ` · ${p.reference}` : ""} · ${when(p.receivedAt, tz)}: ${p.kind === "refund" ? "-" : ""}${m(p.amountMinor)}`, LEFT, { width: RIGHT - LEFT });
    }
  }
  if (inv.returnedPartsNote) {
    heading("Replaced parts");
    text(inv.returnedPartsNote, LEFT, { width: RIGHT - LEFT });
  }
  if (inv.note) {
    doc.moveDown(0.6);
    text(inv.note, LEFT, { width: RIGHT - LEFT });
  }

  heading("Authorisation record");
  if (!view.record.length) text("No approval has been recorded on this job.", LEFT);
  for (const e of view.record) {
    room(60);
    doc.font("Helvetica-Bold");
    text(`${e.title}${e.version > 1 ? ` (version ${e.version})` : ""}`, LEFT, { width: RIGHT - LEFT });
    doc.font("Helvetica");
    const how = e.kind === "dropoff" ? `${e.method === "online" ? "Signed online" : "Signed at the counter"} by ${e.personName}` : e.method === "online" ? `Approved online by ${e.personName}, signed "${e.signatureName ?? e.personName}"` : `${METHOD_LABEL[e.method]}: ${e.personName}${e.phoneCalled ? ` at ${e.phoneCalled}` : ""}`;
    text(`${how} on ${when(e.decidedAt, tz)}${e.method !== "online" && e.recordedBy ? `, ${e.kind === "dropoff" ? "witnessed" : "noted"} by ${e.recordedBy}` : ""}.`, LEFT, { width: RIGHT - LEFT });
    if (e.kind === "dropoff" && e.note) text(`Wording signed: ${pdfText(e.note)}`, LEFT, { width: RIGHT - LEFT });
    if (e.approved.length) text(`Approved: ${e.approved.map((l) => `${l.description} (${pdfText(formatMoney(l.netMinor, e.currency))})`).join("; ")}.`, LEFT, { width: RIGHT - LEFT });
    if (e.declined.length) text(`Declined: ${e.declined.map((l) => l.description).join("; ")}.`, LEFT, { width: RIGHT - LEFT });
    if (e.withdrawn.length) text(`Withdrawn since, not billed: ${e.withdrawn.map((w) => pdfText(withdrawnText(w, when(w.at, tz)))).join(" ")}`, LEFT, { width: RIGHT - LEFT });
    text(`${e.kind === "dropoff" ? "Authorised up to" : "Authorised total"} ${pdfText(formatMoney(e.authorisedTotalMinor, e.currency))}${e.kind === "dropoff" ? " before tax" : ""} · ${e.wantsPartsBack ? "asked for the replaced parts back" : "did not ask for the parts back"} · record ${e.shownHash.slice(0, 12)}`, LEFT, { width: RIGHT - LEFT });
    doc.moveDown(0.5);
  }
  doc.end();
  return done;
}
