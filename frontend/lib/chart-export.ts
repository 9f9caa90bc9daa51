/**
 * A chart on the page as a file: its <svg> serialised with what the page's style sheets and
 * fonts gave it written into the file (colours, strokes and text styles resolved per element,
 * Manrope embedded), so the SVG reads the same anywhere; and that SVG drawn on a canvas at
 * twice its size for a PNG. One helper for every chart (recharts or hand-drawn SVG).
 */
import { PALETTE } from "@shared/palette";

/** Styles a chart's look depends on; each is written onto the element when the page resolves one. */
const STYLE_PROPS = [
  "fill",
  "fill-opacity",
  "stroke",
  "stroke-width",
  "stroke-opacity",
  "stroke-dasharray",
  "stroke-linecap",
  "stroke-linejoin",
  "opacity",
  "font-family",
  "font-size",
  "font-weight",
  "font-style",
  "text-anchor",
  "dominant-baseline",
  "visibility",
] as const;

const SVG_NS = "http://www.w3.org/2000/svg";

/** The weights of Manrope the app ships (fonts/, served at /fonts). */
const FONT_WEIGHTS = [400, 500, 600, 700, 800] as const;
const fontCache = new Map<number, Promise<string | null>>();

function toBase64(buf: ArrayBuffer): string {
  const bytes = new Uint8Array(buf);
  let s = "";
  for (let i = 0; i < bytes.length; i += 0x8000) s += String.fromCharCode(...bytes.subarray(i, i + 0x8000));
  return btoa(s);
}

/** One weight of Manrope as a data URL, fetched once; null when it cannot be had (the file then names the family only). */
function fontDataUrl(weight: number): Promise<string | null> {
  let p = fontCache.get(weight);
  if (!p) {
    p = fetch(`/fonts/manrope-latin-${weight}-normal.woff2`)
      .then(async (r) => (r.ok ? `data:font/woff2;base64,${toBase64(await r.arrayBuffer())}` : null))
      .catch(() => null);
    fontCache.set(weight, p);
  }
  return p;
}

/** The nearest weight the app ships. */
function shippedWeight(w: string): number {
  const n = w === "bold" ? 700 : w === "normal" || w === "" ? 400 : Number(w) || 400;
  return FONT_WEIGHTS.reduce((best, x) => (Math.abs(x - n) < Math.abs(best - n) ? x : best), 400);
}

export interface ChartSvgOptions {
  /** written as the SVG's <title> */
  title?: string;
  /** the background the chart sits on (a chart's own background is usually transparent) */
  background?: string;
}

export interface ChartSvg {
  text: string;
  width: number;
  height: number;
}

function sizeOf(svg: SVGSVGElement): { width: number; height: number } {
  const attr = (n: string) => Number.parseFloat(svg.getAttribute(n) ?? "");
  const box = svg.getBoundingClientRect();
  const vb = svg
    .getAttribute("viewBox")
    ?.split(/[\s,]+/)
    .map(Number);
  const width = attr("width") || box.width || vb?.[2] || 0;
  const height = attr("height") || box.height || vb?.[3] || 0;
  return { width, height };
}

/** The chart's <svg> as a standalone SVG file (text), styles resolved and fonts embedded. */
export async function chartSvg(svg: SVGSVGElement, options: ChartSvgOptions = {}): Promise<ChartSvg> {
  const { width, height } = sizeOf(svg);
  const clone = svg.cloneNode(true) as SVGSVGElement;
  const from = [svg, ...svg.querySelectorAll("*")];
  const to = [clone, ...clone.querySelectorAll("*")];
  const weights = new Set<number>();
  from.forEach((el, i) => {
    const target = to[i] as SVGElement;
    const cs = getComputedStyle(el);
    const style: string[] = [];
    for (const p of STYLE_PROPS) {
      const v = cs.getPropertyValue(p).trim();
      if (v) style.push(`${p}:${v}`);
    }
    if (style.length) target.setAttribute("style", `${style.join(";")};${target.getAttribute("style") ?? ""}`);
    // class names mean nothing outside the page
    target.removeAttribute("class");
    if (el.tagName.toLowerCase() === "text" || el.tagName.toLowerCase() === "tspan") weights.add(shippedWeight(cs.fontWeight));
  });
  if (weights.size === 0 && svg.querySelector("text")) weights.add(400);

  // the serialiser writes the SVG namespace itself (an xmlns attribute set here would be a second one)
  clone.setAttribute("width", String(width));
  clone.setAttribute("height", String(height));
  if (!clone.getAttribute("viewBox")) clone.setAttribute("viewBox", `0 0 ${width} ${height}`);
  // the page sets the root's font; a file must carry its own
  const rootFont = "font-family:Manrope, sans-serif";
  clone.setAttribute("style", `${rootFont};${clone.getAttribute("style") ?? ""}`);

  const faces = await Promise.all(
    [...weights].sort().map(async (w) => {
      const url = await fontDataUrl(w);
      return url ? `@font-face{font-family:"Manrope";font-weight:${w};font-style:normal;src:url(${url}) format("woff2");}` : "";
    }),
  );
  const css = faces.join("");
  const doc = clone.ownerDocument;
  const first = clone.firstChild;
  if (options.title) {
    const t = doc.createElementNS(SVG_NS, "title");
    t.textContent = options.title;
    clone.insertBefore(t, first);
  }
  if (css) {
    const defs = doc.createElementNS(SVG_NS, "defs");
    const style = doc.createElementNS(SVG_NS, "style");
    style.textContent = css;
    defs.appendChild(style);
    clone.insertBefore(defs, first);
  }
  const bg = doc.createElementNS(SVG_NS, "rect");
  bg.setAttribute("width", "100%");
  bg.setAttribute("height", "100%");
  bg.setAttribute("fill", options.background ?? PALETTE.panel);
  clone.insertBefore(bg, first);

  const text = `<?xml version="1.0" encoding="UTF-8"?>\n${new XMLSerializer().serializeToString(clone)}\n`;
  return { text, width, height };
}

/** The SVG drawn on a canvas `scale` times its size, as a PNG blob. */
export async function svgToPng(svg: ChartSvg, scale = 2): Promise<Blob> {
  const url = URL.createObjectURL(new Blob([svg.text], { type: "image/svg+xml" }));
  try {
    const img = new Image();
    img.decoding = "sync";
    await new Promise<void>((resolve, reject) => {
      img.onload = () => resolve();
      img.onerror = () => reject(new Error("The chart could not be drawn as a picture"));
      img.src = url;
    });
    const canvas = document.createElement("canvas");
    canvas.width = Math.round(svg.width * scale);
    canvas.height = Math.round(svg.height * scale);
    const g = canvas.getContext("2d");
    if (!g) throw new Error("This browser cannot draw the picture");
    g.drawImage(img, 0, 0, canvas.width, canvas.height);
    return await new Promise<Blob>((resolve, reject) =>
      canvas.toBlob((b) => (b ? resolve(b) : reject(new Error("This browser cannot write a PNG"))), "image/png"),
    );
  } finally {
    URL.revokeObjectURL(url);
  }
}

/** A file name part from free text: lower-case letters, digits, dots and dashes. */
export function fileSlug(text: string, fallback = "chart"): string {
  return (
    text
      .normalize("NFKD")
      .toLowerCase()
      .replace(/[^a-z0-9.]+/g, "-")
      .replace(/^[-.]+|[-.]+$/g, "")
      .slice(0, 60) || fallback
  );
}
