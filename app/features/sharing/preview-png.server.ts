/**
 * An SVG document as PNG bytes by resvg: pure (no database), so the chores worker thread
 * (server/chores-worker.ts) can draw share pictures off the request thread.
 */
import { createRequire } from "node:module";
import { Resvg } from "@resvg/resvg-js";

// The picture's one font, from an npm package (TrueType, which resvg reads; the page's own
// @fontsource files are WOFF2): the same picture on every machine, whatever fonts it has.
const require = createRequire(import.meta.url);
const FONT_FILES = [
  require.resolve("@expo-google-fonts/lora/400Regular/Lora_400Regular.ttf"),
  require.resolve("@expo-google-fonts/lora/700Bold/Lora_700Bold.ttf"),
];

/** An SVG document as PNG bytes, at the SVG's own size. */
export function svgToPng(svg: string, fontFamily: string): Uint8Array {
  const picture = new Resvg(svg, {
    font: { fontFiles: FONT_FILES, loadSystemFonts: false, defaultFontFamily: fontFamily },
    shapeRendering: 2, // geometricPrecision: anti-aliased lines
    textRendering: 1, // optimizeLegibility
  });
  return picture.render().asPng();
}
