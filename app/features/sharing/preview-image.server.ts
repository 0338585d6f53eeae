/**
 * Link-preview pictures of shared scenarios (issue 12, item 8): an SVG drawn by the share
 * route (app/components/charts/preview-card.tsx) turned into a 1200×630 PNG by resvg, which
 * ships its renderer inside its npm package. Kept per stored run in share_previews, so a link
 * posted to a busy forum is drawn once; a new run (changed settings or engine) draws anew.
 */
import { createHash } from "node:crypto";
import { eq } from "drizzle-orm";
import { getDb } from "~/db/client.server";
import { sharePreviews } from "~/db/schema";
import { svgToPngOffThread } from "~/features/jobs/chores-pool.server";

/**
 * The run's kept preview PNG: `current` when it was drawn under this name (a renamed scenario
 * keeps its run, so the name is part of what was drawn), or null when none was drawn for the run.
 */
export function keptSharePreview(runId: number, name: string): { png: Buffer; current: boolean } | null {
  const kept = getDb()
    .select({ png: sharePreviews.png, name: sharePreviews.name })
    .from(sharePreviews)
    .where(eq(sharePreviews.runId, runId))
    .get();
  return kept ? { png: kept.png, current: kept.name === name } : null;
}

/** Drawings under way in this process, so visitors at once share one (drawing is on another thread). */
const drawing = new Map<string, Promise<Buffer>>();
const drawingKey = (runId: number, name: string) => `${runId}:${name}`;

/** The drawing of this run under this name under way now, if any. */
export function drawingNow(runId: number, name: string): Promise<Buffer> | undefined {
  return drawing.get(drawingKey(runId, name));
}

/**
 * Draws the run's preview PNG under this name (`drawSvg()` rendered by resvg on the chores worker
 * thread, app/features/jobs/chores-pool.server.ts) and keeps it; while it is under way,
 * `drawingNow` hands it to other visitors. The caller counts draws against the owner's limit first.
 */
export function drawSharePreview(
  runId: number,
  name: string,
  drawSvg: () => string,
  fontFamily: string,
): Promise<Buffer> {
  const key = drawingKey(runId, name);
  const started = draw(runId, name, drawSvg, fontFamily).finally(() => drawing.delete(key));
  drawing.set(key, started);
  return started;
}

async function draw(runId: number, name: string, drawSvg: () => string, fontFamily: string): Promise<Buffer> {
  const png = await svgToPngOffThread(drawSvg(), fontFamily);
  // Two app processes can both draw it; the last write wins, and both drew the same.
  getDb()
    .insert(sharePreviews)
    .values({ runId, png, name })
    .onConflictDoUpdate({ target: sharePreviews.runId, set: { png, name } })
    .run();
  return png;
}

/** The picture's validator: its run and the name drawn in it. */
export function previewEtag(runId: number, name: string): string {
  return `"preview-${runId}-${createHash("sha256").update(name).digest("base64url").slice(0, 12)}"`;
}
