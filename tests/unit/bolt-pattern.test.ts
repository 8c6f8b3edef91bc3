import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { BoltPattern } from "@/components/bench/bolt-pattern";
import { crossPatternOrder } from "@/lib/tightening-order";

const render = (count: number, order: number[]) => renderToStaticMarkup(createElement(BoltPattern, { count, order }));

describe("BoltPattern", () => {
  it("states the order for screen readers and draws one badge per bolt", () => {
    // ASME PCC-1 legacy cross pattern, REFERENCES §2: 4 bolts → 1-3-2-4
    const html = render(4, crossPatternOrder(4));
    expect(html).toContain('role="img"');
    expect(html).toContain('aria-label="Tightening order: 1, 3, 2, 4"');
    expect(html.match(/class="fill-oil stroke-ink"/g)).toHaveLength(4);
    // REFERENCES §2: the maker's sequence overrides any generated pattern; the screen must say so
    expect(html).toContain("The maker&#x27;s sequence and values override this generated pattern.");
  });

  it("labels each bolt with its step: bolt 3 is tightened second", () => {
    // ASME PCC-1 legacy cross pattern, REFERENCES §2: 4 bolts → 1-3-2-4
    const html = render(4, [1, 3, 2, 4]);
    const groups = html.match(/<g>.*?<\/g>/g)!;
    const stepAndBolt = groups.map((g) => [...g.matchAll(/<text[^>]*>(\d+)<\/text>/g)].map((m) => Number(m[1])));
    // [step badge, bolt position] per bolt, bolts in position order 1…4
    expect(stepAndBolt).toEqual([
      [1, 1],
      [3, 2],
      [2, 3],
      [4, 4],
    ]);
  });

  it("refuses an order that isn't a permutation of the bolts", () => {
    expect(() => render(4, [1, 2, 2, 4])).toThrow(/each bolt 1–4 exactly once/);
    expect(() => render(4, [1, 2, 3])).toThrow(/exactly once/);
  });
});
