// DESIGN.md §5 story page budget: Largest Contentful Paint ≤ 2.5 s on an emulated phone, first visit.
// Debian's Chromium through Playwright, a 390×844 touch viewport at 3× density, CPU slowed 4× and the
// network at "Slow 3G" through the DevTools protocol. Values of the Slow 3G preset from Puppeteer's
// PredefinedNetworkConditions (puppeteer-core, NetworkConditions.ts, "generally aligned with DevTools"
// NetworkManager.ts): 500 kbps × 0.8 = 400 kbps each way, and latency 400 ms × 5 = 2,000 ms, the factor by
// which DevTools turns a 400 ms packet RTT into request-level latency.
import knex from "knex";
import { knexConfig } from "../../db/config";
import { ceilingBudget, type Part } from "./budget";
import { launchChromium } from "./sessions";
import type { Stack } from "./stack";

const LIMIT_MS = 2500;
const s = (ms: number) => (ms < 0 ? "?" : `${(ms / 1000).toFixed(2)} s`);
const RUNS = Number(process.env.BENCH_LCP_RUNS ?? 3);
const SLOW_3G = { offline: false, downloadThroughput: ((500 * 1000) / 8) * 0.8, uploadThroughput: ((500 * 1000) / 8) * 0.8, latency: 400 * 5 };

export async function storyPath(stack: Stack): Promise<string> {
  const k = knex({ ...knexConfig(stack.databaseUrl), pool: { min: 0, max: 1 } });
  try {
    // A published story, one with a cover first: the cover is the likely largest element.
    const row = (await k("stories as st")
      .join("shops as s", "s.id", "st.shop_id")
      .where("st.status", "published")
      .orderByRaw("st.cover_photo_id IS NULL")
      .orderBy("st.id")
      .first("s.slug as shop", "st.slug as story")) as { shop: string; story: string } | undefined;
    if (!row) throw new Error("the bench database has no published story: the demo seed should have one");
    return `/s/${row.shop}/${row.story}`;
  } finally {
    await k.destroy();
  }
}

export async function storyLcpBudget(stack: Stack, log: (s: string) => void): Promise<Part> {
  const path = await storyPath(stack);
  const url = `${stack.appUrl}${path}`;
  // Once unthrottled, so a page rendered on demand (ISR) is in the server's cache as a visitor finds it.
  for (let i = 0; i < 2; i += 1) await (await fetch(url)).arrayBuffer();
  const browser = await launchChromium();
  const runs: { lcp: number; element: string; bytes: number; firstByte: number; lastByte: number; fcp: number }[] = [];
  try {
    for (let run = 0; run < RUNS; run += 1) {
      const context = await browser.newContext({ viewport: { width: 390, height: 844 }, deviceScaleFactor: 3, isMobile: true, hasTouch: true });
      const page = await context.newPage();
      let bytes = 0;
      page.on("response", (res) => void res.body().then((b) => (bytes += b.length), () => undefined));
      const cdp = await context.newCDPSession(page);
      await cdp.send("Network.enable");
      await cdp.send("Network.setCacheDisabled", { cacheDisabled: true });
      await cdp.send("Network.emulateNetworkConditions", SLOW_3G);
      await cdp.send("Emulation.setCPUThrottlingRate", { rate: 4 });
      const res = await page.goto(url, { waitUntil: "load", timeout: 120_000 });
      if (res?.status() !== 200) throw new Error(`${path} answered ${res?.status()}`);
      await page.waitForLoadState("networkidle", { timeout: 120_000 }).catch(() => undefined);
      // The last candidate the browser reported (buffered, so entries from before this call count).
      const lcp = await page.evaluate(
        () =>
          new Promise<{ time: number; element: string }>((resolve) => {
            new PerformanceObserver((list) => {
              const last = list.getEntries().at(-1) as (PerformanceEntry & { element?: Element | null; url?: string }) | undefined;
              resolve({ time: last?.startTime ?? -1, element: last ? `${last.element?.tagName.toLowerCase() ?? "?"}${last.url ? ` ${last.url.slice(0, 80)}` : ""}` : "none" });
            }).observe({ type: "largest-contentful-paint", buffered: true });
            setTimeout(() => resolve({ time: -1, element: "none reported" }), 5000);
          }),
      );
      if (lcp.time < 0) throw new Error(`no largest-contentful-paint entry for ${path}`);
      // Where the time went: the page's first byte and last byte, and the first paint.
      const steps = await page.evaluate(() => {
        const nav = performance.getEntriesByType("navigation")[0] as PerformanceNavigationTiming | undefined;
        const fcp = performance.getEntriesByName("first-contentful-paint")[0];
        return { firstByte: nav?.responseStart ?? -1, lastByte: nav?.responseEnd ?? -1, fcp: fcp?.startTime ?? -1 };
      });
      runs.push({ lcp: lcp.time, element: lcp.element, bytes, ...steps });
      log(`story LCP run ${run + 1}: ${(lcp.time / 1000).toFixed(2)} s (${lcp.element})`);
      await context.close();
    }
  } finally {
    await browser.close();
  }
  const sorted = [...runs].sort((a, b) => a.lcp - b.lcp);
  const median = sorted[Math.floor(sorted.length / 2)]!;
  return {
    budgets: [ceilingBudget("story LCP", median.lcp / 1000, LIMIT_MS / 1000, "s")],
    lines: [
      `Story page LCP (${path}; 390×844 @3×, CPU 4× slower, Slow 3G: 400 kbps, 2,000 ms latency; cold cache; median of ${RUNS}):`,
      ...runs.map(
        (r, i) =>
          `  run ${i + 1}: ${(r.lcp / 1000).toFixed(2)} s, largest element ${r.element.slice(0, 60)}; page's first byte ${s(r.firstByte)}, last ${s(r.lastByte)}, first paint ${s(r.fcp)}; ${(r.bytes / 1024).toFixed(0)} kB of responses (decoded)`,
      ),
      `  budget ≤ ${LIMIT_MS / 1000} s`,
    ],
  };
}
