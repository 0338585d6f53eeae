/**
 * Link-preview pictures of shared scenarios (issue 12, item 8): an SVG drawn by the share
 * route (app/components/charts/preview-card.tsx) turned into a 1200×630 PNG by resvg, which
 * ships its renderer inside its npm package. Kept per stored run in share_previews, so a link
 * posted to a busy forum is drawn once; a new run (changed settings or engine) draws anew.
 */
import { createRequire } from "node:module";
import { Resvg } from "@resvg/resvg-js";
import { eq } from "drizzle-orm";
import { getDb } from "~/db/client.server";
import { sharePreviews } from "~/db/schema";

// The picture's one font, from an npm package (TrueType, which resvg reads; the page's own
// @fontsource files are WOFF2): the same picture on every machine, whatever fonts it has.
const require = createRequire(import.meta.url);
const FONT_FILES = [
  require.resolve("@expo-google-fonts/lora/400Regular/Lora_400Regular.ttf"),
  require.resolve("@expo-google-fonts/lora/700Bold/Lora_700Bold.ttf"),
];

/** An SVG document as PNG bytes, at the SVG's own size. */
function svgToPng(svg: string, fontFamily: string): Buffer {
  const picture = new Resvg(svg, {
    font: { fontFiles: FONT_FILES, loadSystemFonts: false, defaultFontFamily: fontFamily },
    shapeRendering: 2, // geometricPrecision: anti-aliased lines
    textRendering: 1, // optimizeLegibility
  });
  return picture.render().asPng();
}

/** The run's preview PNG: the kept one, or `drawSvg()` rendered and kept. */
export function sharePreviewPng(runId: number, drawSvg: () => string, fontFamily: string): Buffer {
  const db = getDb();
  const kept = db.select({ png: sharePreviews.png }).from(sharePreviews).where(eq(sharePreviews.runId, runId)).get();
  if (kept) return kept.png;
  const png = svgToPng(drawSvg(), fontFamily);
  // Two first visitors at once both draw; the second write is a no-op.
  db.insert(sharePreviews).values({ runId, png }).onConflictDoNothing().run();
  return png;
}
