// Our own worked examples of the pure helpers behind the SVG/PNG export.
import { describe, expect, it } from "vitest";
import { escapeXml, layoutLegend, parseFontSrc, pickFontFaces, type FontFaceInfo } from "~/components/charts/downloads";

describe("parseFontSrc", () => {
  it("reads url() and format() pairs", () => {
    expect(
      parseFontSrc(
        `url("https://x.test/a/lora-latin-400.woff2") format("woff2"), url(/a/lora-latin-400.woff) format('woff')`,
      ),
    ).toEqual([
      { url: "https://x.test/a/lora-latin-400.woff2", format: "woff2" },
      { url: "/a/lora-latin-400.woff", format: "woff" },
    ]);
    expect(parseFontSrc("url(a.ttf)")).toEqual([{ url: "a.ttf", format: null }]);
  });
});

describe("pickFontFaces", () => {
  const face = (over: Partial<FontFaceInfo>): FontFaceInfo => ({
    family: '"Lora"',
    weight: "400",
    style: "normal",
    unicodeRange: "U+0000-00FF, U+0131, U+0152-0153",
    src: "",
    ...over,
  });

  it("keeps the Latin subset of the wanted family and weights", () => {
    const rules = [
      face({}),
      face({ weight: "600" }),
      face({ weight: "700" }),
      face({ style: "italic" }),
      face({ unicodeRange: "U+0100-02BA, U+02BD-02C5" }),
      face({ family: "Other" }),
    ];
    expect(pickFontFaces(rules, "Lora", ["400", "600"])).toEqual([rules[0], rules[1]]);
  });
});

describe("escapeXml", () => {
  it("escapes markup characters", () => {
    expect(escapeXml(`<a href="x">Tom & Jo's</a>`)).toBe("&lt;a href=&quot;x&quot;&gt;Tom &amp; Jo&apos;s&lt;/a&gt;");
  });
});

describe("layoutLegend", () => {
  it("wraps items into rows that fit the width", () => {
    const items = ["Total ammonia (TAN)", "Free ammonia (NH3)", "Nitrite (NO2)", "Nitrate (NO3)"].map((label) => ({
      label,
      color: "#000000",
    }));
    const wide = layoutLegend(items, 1000, 12);
    expect(new Set(wide.placed.map((p) => p.row)).size).toBe(1);
    const narrow = layoutLegend(items, 300, 12);
    expect(narrow.placed.map((p) => p.row)).toEqual([0, 1, 1, 2]);
    expect(narrow.height).toBe(3 * narrow.rowHeight);
    expect(layoutLegend([], 300, 12).height).toBe(0);
  });
});
