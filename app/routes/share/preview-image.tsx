import { renderToStaticMarkup } from "react-dom/server";
import type { Route } from "./+types/preview-image";
import { PREVIEW_FONT, PreviewCard } from "~/components/charts/preview-card";
import { readOnlyScenarioView } from "~/features/runs/read-only-view.server";
import { unpackSeries } from "~/features/runs/series-packing";
import { previewEtag, sharePreviewPng } from "~/features/sharing/preview-image.server";
import { findLinkByToken, isLive } from "~/features/sharing/share.server";
import { notFound } from "~/permissions.server";
import { DEFAULT_PREFERENCES, displayUnitsFor } from "~/utils/display-units";

/**
 * GET /s/:token/preview.png — the link-preview picture of a shared scenario (og:image): its
 * chart and key figures as a 1200×630 PNG in the anonymous visitor's units. Like the page, it
 * answers only while the link is live, and is asked for again on every use (no-cache with an
 * ETag per run), so a link turned off stops showing its picture at once.
 */
export async function loader({ request, params }: Route.LoaderArgs) {
  const found = findLinkByToken(params.token);
  if (!found || !isLive(found.link)) notFound("This link is not shared, or no longer.");
  const view = await readOnlyScenarioView(found.scenario, found.tank, displayUnitsFor(DEFAULT_PREFERENCES));
  const results = view.results;
  if (!results) notFound("This scenario has no results to show.");
  const etag = previewEtag(results.runId, found.scenario.name);
  const headers = { "Cache-Control": "no-cache", ETag: etag, "X-Robots-Tag": "noindex" };
  if (request.headers.get("If-None-Match") === etag) return new Response(null, { status: 304, headers });
  const png = sharePreviewPng(
    results.runId,
    found.scenario.name,
    () =>
      renderToStaticMarkup(
        <PreviewCard
          name={found.scenario.name}
          lengthDays={results.lengthDays}
          series={unpackSeries(results.packedSeries)}
          guides={results.guides}
          labels={results.labels}
          keyFigures={results.keyFigures}
        />,
      ),
    PREVIEW_FONT,
  );
  return new Response(new Uint8Array(png), { headers: { ...headers, "Content-Type": "image/png", "Content-Length": String(png.length) } });
}
