import { cleanup, fireEvent, render, screen, waitFor, within } from "@testing-library/react";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import type { ResultFile } from "@shared/schemas/result-file";
import { ChartFileName } from "@frontend/components/ui/chart-download";
import { StackUpPanel } from "@frontend/features/studies/components/stack-up-panel";
import { svgToPng } from "@frontend/lib/chart-export";

// recharts in jsdom and a computed style per element are slow on a busy machine
vi.setConfig({ testTimeout: 30_000 });
afterEach(cleanup);

// jsdom lays nothing out: recharts measures its wrapper, so it is given a size here.
const WIDTH = 560;
const HEIGHT = 200;
const FONT_BYTES = new Uint8Array([0x77, 0x4f, 0x46, 0x32, 1, 2, 3, 250]); // "wOF2" and a few bytes

let saved: { name: string; blob: Blob }[];
const blobs = new Map<string, Blob>();

beforeEach(() => {
  saved = [];
  blobs.clear();
  vi.stubGlobal(
    "ResizeObserver",
    class {
      observe() {}
      unobserve() {}
      disconnect() {}
    },
  );
  vi.spyOn(HTMLElement.prototype, "getBoundingClientRect").mockImplementation(function (this: HTMLElement) {
    const sized = this.classList.contains("recharts-wrapper");
    return { x: 0, y: 0, top: 0, left: 0, right: 0, bottom: 0, width: sized ? WIDTH : 0, height: sized ? HEIGHT : 0, toJSON() {} };
  });
  let n = 0;
  URL.createObjectURL = (b: Blob) => {
    const url = `blob:test/${++n}`;
    blobs.set(url, b);
    return url;
  };
  URL.revokeObjectURL = () => {};
  vi.spyOn(HTMLAnchorElement.prototype, "click").mockImplementation(function (this: HTMLAnchorElement) {
    saved.push({ name: this.download, blob: blobs.get(this.href)! });
  });
  vi.stubGlobal(
    "fetch",
    vi.fn(async (url: string) =>
      String(url).startsWith("/fonts/manrope-latin-") ? new Response(FONT_BYTES) : new Response("not found", { status: 404 }),
    ),
  );
});

const { createObjectURL, revokeObjectURL } = URL;
afterEach(() => {
  URL.createObjectURL = createObjectURL;
  URL.revokeObjectURL = revokeObjectURL;
  vi.restoreAllMocks();
  vi.unstubAllGlobals();
});

const row = (metric: string, worstCase: number, rss: number, mc3Sigma: number, mcP9973: number) => ({
  metric,
  nominal: 0,
  worstCase,
  rss,
  linear3Sigma: rss * 0.9,
  mc3Sigma,
  mcP9973,
});
const result = {
  stackUp: [
    row("mag.crossAxisPct.xy", 1.2, 0.71, 0.66, 0.69),
    row("mag.crossAxisPct.xz", 2.4, 1.3, 1.25, 1.28),
    row("mag.crossAxisPct.yz", 1.9, 1.1, 1.0, 1.02),
  ],
  metrics: { "mag.crossAxisPct.xy": { unit: "%" } },
} as unknown as ResultFile;

function renderPanel() {
  render(
    <ChartFileName value="ridgeline-watch-study-2">
      <StackUpPanel result={result} elementOrder={["board", "mag"]} />
    </ChartFileName>,
  );
  return screen.getByRole("figure", { name: "Stack-up of mag" });
}

describe("a chart's download menu", () => {
  it("saves the chart as a well-formed SVG with its bars, labels, colours and font in the file", async () => {
    const figure = renderPanel();
    // the chart drew: 3 terms × 4 series
    expect(figure.querySelectorAll(".recharts-bar-rectangle path")).toHaveLength(12);
    fireEvent.click(within(figure).getByRole("button", { name: "Download Worst case, RSS and Monte Carlo of mag" }));
    fireEvent.click(screen.getByRole("menuitem", { name: "SVG drawing" }));
    await waitFor(() => expect(saved).toHaveLength(1));
    expect(saved[0].name).toBe("ridgeline-watch-study-2-stack-up-mag.svg");
    expect(saved[0].blob.type).toBe("image/svg+xml");

    const text = await saved[0].blob.text();
    const doc = new DOMParser().parseFromString(text, "image/svg+xml");
    expect(doc.querySelector("parsererror")).toBeNull();
    const svg = doc.documentElement;
    expect(svg.localName).toBe("svg");
    expect(svg.namespaceURI).toBe("http://www.w3.org/2000/svg");
    expect([svg.getAttribute("width"), svg.getAttribute("height")]).toEqual([String(WIDTH), String(HEIGHT)]);
    expect(svg.getAttribute("viewBox")).toBe(`0 0 ${WIDTH} ${HEIGHT}`);
    expect(svg.querySelector("title")?.textContent).toBe("Worst case, RSS and Monte Carlo of mag");
    // the chart's content: every bar, in its series' colour, and the terms on the axis
    const bars = [...svg.querySelectorAll("path")].filter((p) => p.getAttribute("fill-opacity") === "0.85");
    expect(bars).toHaveLength(12);
    const fills = new Set(bars.map((b) => b.getAttribute("fill")));
    expect(fills).toEqual(new Set(["#b91c1c", "#c2903f", "#64748b", "#17212b"]));
    const words = [...svg.querySelectorAll("text")].map((t) => t.textContent);
    expect(words).toEqual(expect.arrayContaining(["xy", "xz", "yz"]));
    // text styles are written on the elements, the page's class names are gone
    const tick = [...svg.querySelectorAll("text")].find((t) => t.textContent === "xz")!;
    expect(tick.getAttribute("font-size") ?? tick.getAttribute("style")).toMatch(/10\.5/);
    expect(text).not.toMatch(/class="/);
    // Manrope embedded (the weights the text uses), and a background under the chart
    expect(text).toContain(`src:url(data:font/woff2;base64,${btoa(String.fromCharCode(...FONT_BYTES))}) format("woff2")`);
    expect(svg.querySelector(":scope > rect")?.getAttribute("fill")).toBe("#fffefb");
    // nothing from the page's tooltip or legend outside the chart's own drawing
    expect(text).not.toMatch(/recharts-tooltip-wrapper/);
  });

  it("draws the SVG on a canvas at twice its size for the PNG", async () => {
    // jsdom decodes no images and has no 2D canvas: both are stood in for, and what the helper
    // asks of them is checked (canvas size, what is drawn at what size, the PNG type)
    const drawn: unknown[][] = [];
    let loadedFrom = "";
    vi.stubGlobal(
      "Image",
      class {
        onload: (() => void) | null = null;
        onerror: (() => void) | null = null;
        decoding = "";
        set src(v: string) {
          loadedFrom = v;
          queueMicrotask(() => this.onload?.());
        }
      },
    );
    vi.spyOn(HTMLCanvasElement.prototype, "getContext").mockImplementation(
      () => ({ drawImage: (...args: unknown[]) => drawn.push(args) }) as unknown as CanvasRenderingContext2D,
    );
    let canvasSize: number[] = [];
    vi.spyOn(HTMLCanvasElement.prototype, "toBlob").mockImplementation(function (this: HTMLCanvasElement, cb, type) {
      canvasSize = [this.width, this.height];
      cb(new Blob(["png"], { type }));
    });

    const figure = renderPanel();
    fireEvent.click(within(figure).getByRole("button", { name: /^Download / }));
    fireEvent.click(screen.getByRole("menuitem", { name: "PNG picture (2×)" }));
    await waitFor(() => expect(saved).toHaveLength(1));
    expect(saved[0].name).toBe("ridgeline-watch-study-2-stack-up-mag.png");
    expect(saved[0].blob.type).toBe("image/png");
    expect(canvasSize).toEqual([2 * WIDTH, 2 * HEIGHT]);
    expect(drawn).toHaveLength(1);
    expect(drawn[0].slice(1)).toEqual([0, 0, 2 * WIDTH, 2 * HEIGHT]);
    // the picture was drawn from the SVG file itself
    const source = blobs.get(loadedFrom)!;
    expect(source.type).toBe("image/svg+xml");
    expect(await source.text()).toMatch(/^<\?xml[^]*<svg[^]*<title>Worst case, RSS and Monte Carlo of mag<\/title>/);
  });

  it("says so when the picture cannot be drawn", async () => {
    vi.stubGlobal(
      "Image",
      class {
        onload: (() => void) | null = null;
        onerror: (() => void) | null = null;
        set src(_: string) {
          queueMicrotask(() => this.onerror?.());
        }
      },
    );
    await expect(svgToPng({ text: "<svg/>", width: 10, height: 10 })).rejects.toThrow("The chart could not be drawn as a picture");
  });
});
