/**
 * Client-side downloads: CSV text, the chart as a standalone SVG file, and the chart as a PNG
 * drawn at 2× through a canvas. Nothing leaves the browser; files are handed over with a Blob
 * and an object URL. Functions that touch the DOM run only from click handlers; the string
 * helpers are pure and unit-tested.
 */
import { INK, SERIF_STACK } from "~/components/charts/palette";

export type LegendItem = { label: string; color: string; dash?: string; width?: number; opacity?: number };

/** Save a Blob under `fileName` through a temporary link. */
export function downloadBlob(blob: Blob, fileName: string): void {
  const url = URL.createObjectURL(blob);
  const a = document.createElement("a");
  a.href = url;
  a.download = fileName;
  a.rel = "noopener";
  document.body.appendChild(a);
  a.click();
  a.remove();
  // Give the browser a moment to start the download before the URL goes.
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

/** CSV with a UTF-8 byte-order mark, so spreadsheet programs read plant names with accents. */
export function downloadCsv(text: string, fileName: string): void {
  downloadBlob(new Blob(["\uFEFF", text], { type: "text/csv;charset=utf-8" }), fileName);
}

export function escapeXml(s: string): string {
  return s.replace(/[<>&"']/g, (c) => ({ "<": "&lt;", ">": "&gt;", "&": "&amp;", '"': "&quot;", "'": "&apos;" })[c]!);
}

export type FontFaceInfo = { family: string; weight: string; style: string; unicodeRange: string; src: string };

/** The url() sources of a CSS `src` descriptor, with their format() when given. */
export function parseFontSrc(src: string): { url: string; format: string | null }[] {
  const out: { url: string; format: string | null }[] = [];
  const re = /url\(\s*(['"]?)([^'")]+)\1\s*\)(?:\s*format\(\s*(['"]?)([^'")]+)\3\s*\))?/g;
  for (let m = re.exec(src); m; m = re.exec(src)) out.push({ url: m[2], format: m[4] ?? null });
  return out;
}

/**
 * The @font-face rules an exported chart needs: the given family, normal style, the given
 * weights, and only the Latin subset (the one whose range covers U+0000–00FF, or no range).
 */
export function pickFontFaces(
  rules: readonly FontFaceInfo[],
  family: string,
  weights: readonly string[],
): FontFaceInfo[] {
  const norm = (s: string) =>
    s
      .replace(/^['"]|['"]$/g, "")
      .trim()
      .toLowerCase();
  return rules.filter(
    (r) =>
      norm(r.family) === norm(family) &&
      (r.style === "" || r.style === "normal") &&
      weights.includes(r.weight) &&
      (r.unicodeRange === "" || /U\+0+-0*FF\b/i.test(r.unicodeRange)),
  );
}

/** Lay legend items out in rows across `width`; text widths are estimated from the font size. */
export function layoutLegend(items: readonly LegendItem[], width: number, fontSize: number) {
  const swatch = 24;
  const gap = 14;
  const rowHeight = Math.round(fontSize * 1.6);
  const placed: { item: LegendItem; x: number; row: number }[] = [];
  let x = 0;
  let row = 0;
  for (const item of items) {
    const w = swatch + 6 + item.label.length * fontSize * 0.56;
    if (x > 0 && x + w > width) {
      x = 0;
      row++;
    }
    placed.push({ item, x, row });
    x += w + gap;
  }
  return { placed, height: items.length ? (row + 1) * rowHeight : 0, rowHeight };
}

function collectFontFaceRules(): FontFaceInfo[] {
  const out: FontFaceInfo[] = [];
  for (const sheet of Array.from(document.styleSheets)) {
    let rules: CSSRuleList;
    try {
      rules = sheet.cssRules;
    } catch {
      continue; // another origin's sheet
    }
    const walk = (list: CSSRuleList) => {
      for (const rule of Array.from(list)) {
        if (rule instanceof CSSFontFaceRule) {
          const st = rule.style;
          const src = st.getPropertyValue("src");
          const base = sheet.href ?? document.baseURI;
          out.push({
            family: st.getPropertyValue("font-family"),
            weight: st.getPropertyValue("font-weight") || "400",
            style: st.getPropertyValue("font-style"),
            unicodeRange: st.getPropertyValue("unicode-range"),
            // Resolve against the sheet so the fetch below finds the file.
            src: src.replace(
              /url\(\s*(['"]?)([^'")]+)\1\s*\)/g,
              (_m, _q, u: string) => `url("${new URL(u, base).href}")`,
            ),
          });
        } else if ("cssRules" in rule && (rule as CSSGroupingRule).cssRules) {
          walk((rule as CSSGroupingRule).cssRules);
        }
      }
    };
    walk(rules);
  }
  return out;
}

async function toDataUrl(url: string): Promise<string> {
  const blob = await (await fetch(url)).blob();
  return await new Promise<string>((resolve, reject) => {
    const r = new FileReader();
    r.onload = () => resolve(String(r.result));
    r.onerror = () => reject(r.error);
    r.readAsDataURL(blob);
  });
}

/** @font-face rules for Lora 400 and 600 with the font files embedded as data URLs. */
async function embeddedFontCss(): Promise<string> {
  const faces = pickFontFaces(collectFontFaceRules(), "Lora", ["400", "600"]);
  const css: string[] = [];
  for (const f of faces) {
    const srcs = parseFontSrc(f.src);
    const best = srcs.find((s) => s.format === "woff2") ?? srcs[0];
    if (!best) continue;
    try {
      const data = await toDataUrl(best.url);
      css.push(
        `@font-face{font-family:"Lora";font-style:normal;font-weight:${f.weight};src:url(${data})${best.format ? ` format("${best.format}")` : ""};}`,
      );
    } catch {
      // Without the file the export falls back to Georgia/serif: still a usable chart.
    }
  }
  return css.join("\n");
}

const TEXT_PROPS = ["font-family", "font-size", "font-weight", "font-style", "fill", "letter-spacing"] as const;

/**
 * A standalone SVG document of a chart: the cursor left out, computed text styles inlined,
 * Lora embedded, a white background, the title above and the legend below.
 */
export async function standaloneSvg(
  svg: SVGSVGElement,
  opts: { title: string; legend?: readonly LegendItem[] },
): Promise<{ text: string; width: number; height: number }> {
  const width = svg.width.baseVal.value || svg.getBoundingClientRect().width;
  const chartHeight = svg.height.baseVal.value || svg.getBoundingClientRect().height;
  const clone = svg.cloneNode(true) as SVGSVGElement;

  // Inline what CSS decided for text, pairing original and clone elements in document order.
  const src = Array.from(svg.querySelectorAll("text"));
  const dst = Array.from(clone.querySelectorAll("text"));
  src.forEach((el, k) => {
    const cs = getComputedStyle(el);
    for (const p of TEXT_PROPS) {
      const v = cs.getPropertyValue(p);
      if (v) dst[k]?.style.setProperty(p, v);
    }
  });
  clone.querySelectorAll("[data-export='skip']").forEach((el) => el.remove());
  clone.querySelectorAll("[class]").forEach((el) => el.removeAttribute("class"));
  clone.removeAttribute("class");
  for (const a of ["role", "aria-labelledby", "aria-hidden"]) clone.removeAttribute(a);

  const fontSize = 14;
  const pad = 12;
  const header = Math.round(fontSize * 2.2);
  const legend = layoutLegend(opts.legend ?? [], width - 2 * pad, 12);
  const height = Math.round(header + chartHeight + (legend.height ? legend.height + pad : 0) + pad / 2);

  const ns = "http://www.w3.org/2000/svg";
  const inner = clone.innerHTML;
  const legendSvg = legend.placed
    .map(({ item, x, row }) => {
      const y = header + chartHeight + pad / 2 + row * legend.rowHeight + legend.rowHeight / 2;
      return (
        `<g transform="translate(${pad + x},${y})">` +
        `<line x1="0" x2="24" y1="0" y2="0" stroke="${escapeXml(item.color)}" stroke-width="${item.width ?? 2.5}"` +
        (item.dash ? ` stroke-dasharray="${escapeXml(item.dash)}"` : "") +
        (item.opacity != null ? ` stroke-opacity="${item.opacity}"` : "") +
        `/><text x="30" dy="0.32em" font-size="12" fill="${INK}">${escapeXml(item.label)}</text></g>`
      );
    })
    .join("");
  const fonts = await embeddedFontCss();
  const text =
    `<?xml version="1.0" encoding="UTF-8"?>\n` +
    `<svg xmlns="${ns}" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}" font-family="${escapeXml(SERIF_STACK)}">` +
    (fonts ? `<style>${fonts}</style>` : "") +
    `<title>${escapeXml(opts.title)}</title>` +
    `<rect width="100%" height="100%" fill="#ffffff"/>` +
    `<text x="${pad}" y="${Math.round(fontSize * 1.5)}" font-size="${fontSize + 2}" font-weight="600" fill="#1c1917">${escapeXml(opts.title)}</text>` +
    `<g transform="translate(0,${header})">${inner}</g>` +
    legendSvg +
    `</svg>\n`;
  return { text, width, height };
}

/** Draw SVG text into a canvas at `scale`× and return it as a PNG Blob. */
export async function svgToPng(svgText: string, width: number, height: number, scale = 2): Promise<Blob> {
  const img = new Image();
  img.decoding = "async";
  const loaded = new Promise<void>((resolve, reject) => {
    img.onload = () => resolve();
    img.onerror = () => reject(new Error("The chart image could not be drawn"));
  });
  img.src = `data:image/svg+xml;charset=utf-8,${encodeURIComponent(svgText)}`;
  await loaded;
  const canvas = document.createElement("canvas");
  canvas.width = Math.round(width * scale);
  canvas.height = Math.round(height * scale);
  const ctx = canvas.getContext("2d");
  if (!ctx) throw new Error("This browser cannot draw to a canvas");
  ctx.fillStyle = "#ffffff";
  ctx.fillRect(0, 0, canvas.width, canvas.height);
  ctx.drawImage(img, 0, 0, canvas.width, canvas.height);
  return await new Promise<Blob>((resolve, reject) =>
    canvas.toBlob((b) => (b ? resolve(b) : reject(new Error("The PNG could not be made"))), "image/png"),
  );
}
