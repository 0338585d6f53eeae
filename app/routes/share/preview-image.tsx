import { renderToStaticMarkup } from "react-dom/server";
import type { Route } from "./+types/preview-image";
import { PREVIEW_FONT, PreviewCard } from "~/components/charts/preview-card";
import { readOnlyScenarioView } from "~/features/runs/read-only-view.server";
import { unpackSeries } from "~/features/runs/series-packing";
import { drawingNow, drawSharePreview, keptSharePreview, previewEtag } from "~/features/sharing/preview-image.server";
import { giveBack, take, waitText } from "~/rate-limits.server";
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
  const first = keptSharePreview(results.runId, found.scenario.name);
  if (first?.current) return picture(first.png, headers);
  const under = drawingNow(results.runId, found.scenario.name);
  if (under) return picture(await under, headers);
  // Drawing takes a worker thread for about 50 ms, and renaming the scenario asks for a new
  // drawing: renaming and fetching in a loop kept the request thread drawing, so draws count
  // per owner (issue 10).
  const owner = `user:${found.tank.ownerId}`;
  const wait = await take("sharePicturesPerOwner", owner);
  // Visitors who came at once: the first drew it while the others waited for their count.
  const kept = keptSharePreview(results.runId, found.scenario.name);
  if (kept?.current) {
    if (wait === 0) await giveBack("sharePicturesPerOwner", owner);
    return picture(kept.png, headers);
  }
  const meanwhile = drawingNow(results.runId, found.scenario.name);
  if (meanwhile) {
    if (wait === 0) await giveBack("sharePicturesPerOwner", owner);
    return picture(await meanwhile, headers);
  }
  if (wait > 0) {
    // The picture under the scenario's former name rather than none; drawn anew later.
    if (kept) return picture(kept.png, { ...headers, ETag: `"stale-${results.runId}"` });
    return new Response(`This picture was drawn too often just now. Try again in ${waitText(wait)}.`, {
      status: 429,
      headers: {
        "Retry-After": String(wait),
        "Content-Type": "text/plain; charset=utf-8",
        "Cache-Control": "no-store",
      },
    });
  }
  const png = await drawSharePreview(
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
  return picture(png, headers);
}

function picture(png: Buffer, headers: Record<string, string>): Response {
  return new Response(new Uint8Array(png), {
    headers: { ...headers, "Content-Type": "image/png", "Content-Length": String(png.length) },
  });
}
