/** Three buttons: the series as CSV, the chart as SVG, the chart as PNG (made in the browser; the CSV from `csvHref` when given). */
import { useState } from "react";
import { downloadBlob, downloadCsv, standaloneSvg, svgToPng, type LegendItem } from "~/components/charts/downloads";

export type ChartDownloadsProps = {
  /** File name without extension, e.g. "crowded-reach-year". */
  fileName: string;
  /** Title written into the image files. */
  title: string;
  getSvg: () => SVGSVGElement | null;
  /** CSV text, built only when asked for. */
  getCsv: () => string;
  /** Download the CSV from here instead (the server has samples the page was not sent). */
  csvHref?: string;
  legend?: readonly LegendItem[];
};

export function ChartDownloads({ fileName, title, getSvg, getCsv, csvHref, legend }: ChartDownloadsProps) {
  const [status, setStatus] = useState("");
  const [busy, setBusy] = useState(false);

  const image = async (kind: "svg" | "png") => {
    const svg = getSvg();
    if (!svg) return setStatus("The chart has not been drawn yet.");
    setBusy(true);
    try {
      const out = await standaloneSvg(svg, { title, legend });
      if (kind === "svg") downloadBlob(new Blob([out.text], { type: "image/svg+xml" }), `${fileName}.svg`);
      else downloadBlob(await svgToPng(out.text, out.width, out.height, 2), `${fileName}.png`);
      setStatus(`${kind.toUpperCase()} file made: ${fileName}.${kind}`);
    } catch (e) {
      setStatus(e instanceof Error ? e.message : "The file could not be made.");
    } finally {
      setBusy(false);
    }
  };

  return (
    <div className="flex flex-wrap items-center gap-2 text-sm" role="group" aria-label="Download">
      <span className="text-stone-700">Download:</span>
      {csvHref ? (
        <a
          className="btn-secondary"
          href={csvHref}
          download={`${fileName}.csv`}
          aria-label="Download every sample as a CSV file"
        >
          CSV
        </a>
      ) : (
        <button
          type="button"
          className="btn-secondary"
          onClick={() => {
            downloadCsv(getCsv(), `${fileName}.csv`);
            setStatus(`CSV file made: ${fileName}.csv`);
          }}
          aria-label="Download the series as a CSV file"
        >
          CSV
        </button>
      )}
      <button
        type="button"
        className="btn-secondary"
        disabled={busy}
        onClick={() => void image("svg")}
        aria-label="Download the chart as an SVG image"
      >
        SVG
      </button>
      <button
        type="button"
        className="btn-secondary"
        disabled={busy}
        onClick={() => void image("png")}
        aria-label="Download the chart as a PNG image"
      >
        PNG
      </button>
      <span className="text-xs text-stone-600" role="status">
        {status}
      </span>
    </div>
  );
}
