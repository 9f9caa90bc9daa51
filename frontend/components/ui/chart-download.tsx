/**
 * A small "download" menu for one chart: PNG (twice the size on screen) or SVG. Put it inside
 * the chart's <figure>; it takes the figure's chart <svg> when asked. The file is named from
 * the nearest ChartFileName (the study, say) and the chart's own name.
 */
import { createContext, useContext, useEffect, useRef, useState } from "react";
import { chartSvg, fileSlug, svgToPng } from "@frontend/lib/chart-export";
import { downloadBlob } from "@frontend/lib/download";
import { cn } from "@frontend/lib/cn";

/** What the files of the charts below are named after, e.g. "ridgeline-watch-study-2". */
export const ChartFileName = createContext<string>("chart");

const DownloadIcon = () => (
  <svg
    width="13"
    height="13"
    viewBox="0 0 16 16"
    fill="none"
    stroke="currentColor"
    strokeWidth="1.5"
    strokeLinecap="round"
    strokeLinejoin="round"
    aria-hidden="true"
  >
    <path d="M8 2.5v8M4.5 7.5 8 11l3.5-3.5M2.5 13.5h11" />
  </svg>
);

/** The chart's drawing in a figure: recharts' surface (not a legend icon), else the first svg. */
export function chartSurface(figure: Element): SVGSVGElement | null {
  return (
    figure.querySelector<SVGSVGElement>(".recharts-wrapper > svg") ??
    figure.querySelector<SVGSVGElement>("svg[data-chart-surface]") ??
    figure.querySelector<SVGSVGElement>("svg:not([aria-hidden='true'])")
  );
}

export function ChartDownload({ name, title, className }: { name: string; title: string; className?: string }) {
  const base = useContext(ChartFileName);
  const [open, setOpen] = useState(false);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const root = useRef<HTMLDivElement>(null);

  useEffect(() => {
    if (!open) return;
    const close = (e: MouseEvent) => {
      if (!root.current?.contains(e.target as Node)) setOpen(false);
    };
    const key = (e: KeyboardEvent) => {
      if (e.key === "Escape") setOpen(false);
    };
    document.addEventListener("mousedown", close);
    document.addEventListener("keydown", key);
    return () => {
      document.removeEventListener("mousedown", close);
      document.removeEventListener("keydown", key);
    };
  }, [open]);

  const fileBase = `${fileSlug(base)}-${fileSlug(name)}`;
  const save = async (format: "png" | "svg") => {
    setOpen(false);
    const figure = root.current?.closest("figure");
    const svg = figure ? chartSurface(figure) : null;
    if (!svg) {
      setError("Nothing drawn to save yet");
      return;
    }
    setBusy(true);
    setError(null);
    try {
      const file = await chartSvg(svg, { title });
      if (format === "svg") downloadBlob(new Blob([file.text], { type: "image/svg+xml" }), `${fileBase}.svg`);
      else downloadBlob(await svgToPng(file, 2), `${fileBase}.png`);
    } catch (e) {
      setError(e instanceof Error ? e.message : "The chart could not be saved");
    } finally {
      setBusy(false);
    }
  };

  return (
    // positioned either way (the menu hangs from it): in the flow unless the caller places it
    <div ref={root} className={cn("z-10", className ?? "relative")} data-chart-download={fileBase}>
      <button
        type="button"
        aria-haspopup="menu"
        aria-expanded={open}
        aria-label={`Download ${title}`}
        title={error ?? `Download ${title} as PNG or SVG`}
        disabled={busy}
        onClick={() => setOpen((o) => !o)}
        className={cn(
          "flex h-6 items-center gap-1 rounded border border-line bg-panel/90 px-1.5 text-[11px] font-semibold text-ink/60 hover:text-ink focus-visible:ring-2 focus-visible:ring-gyro/40 focus-visible:outline-none disabled:opacity-50",
          error ? "text-fail" : "",
        )}
      >
        <DownloadIcon />
      </button>
      {open ? (
        <div
          role="menu"
          aria-label={`Download ${title}`}
          className="absolute top-full right-0 mt-1 w-44 rounded-md border border-line bg-panel p-1 shadow-[0_12px_32px_-8px_rgba(23,33,43,0.35)]"
        >
          <button
            role="menuitem"
            type="button"
            onClick={() => void save("png")}
            className="flex h-7 w-full items-center rounded px-2 text-left text-xs font-semibold text-ink hover:bg-ink/[0.06]"
          >
            PNG picture (2×)
          </button>
          <button
            role="menuitem"
            type="button"
            onClick={() => void save("svg")}
            className="flex h-7 w-full items-center rounded px-2 text-left text-xs font-semibold text-ink hover:bg-ink/[0.06]"
          >
            SVG drawing
          </button>
        </div>
      ) : null}
      {error ? (
        <p role="status" className="absolute top-full right-0 mt-1 w-max max-w-56 rounded bg-panel px-1.5 py-0.5 text-[11px] text-fail">
          {error}
        </p>
      ) : null}
    </div>
  );
}
