/**
 * The 3D view in a real browser (Debian's chromium, WebGL through SwiftShader): a tiny
 * page (tests/e2e/viewer-harness) served by Vite with the project's config mounts the
 * viewer with the reference stack and study. The pictures are checked by their pixels,
 * read back from the canvas (preserveDrawingBuffer), not through the DOM.
 * Screenshots go to tests/e2e/.artifacts/.
 */
import { mkdirSync, readFileSync, writeFileSync, existsSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { fileURLToPath } from "node:url";
import { chromium, type Browser, type Page } from "playwright-core";
import { createServer, type Plugin, type ViteDevServer } from "vite";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { rotVec } from "@shared/engine/rotation";
import { poseOfTrial } from "@shared/engine/study";
import { StackFileSchema } from "@shared/schemas/stack-file";
import { StudyFileSchema } from "@shared/schemas/study-file";
import { compileForViewer, poseSet, trialDraws } from "@frontend/features/viewer3d/lib/poses";
import { exaggerateDirection, exaggerateRotation, logRotation } from "@frontend/features/viewer3d/lib/rotation-math";

const ROOT = fileURLToPath(new URL("../..", import.meta.url));
const HARNESS = join(ROOT, "tests/e2e/viewer-harness");
const ARTIFACTS = join(ROOT, "tests/e2e/.artifacts");
const FONTS = join(ROOT, "fonts");

// ---------------------------------------------------------------- the math behind "angles ×k"

describe("exaggeration of rotations", () => {
  const mul = (a: Float64Array, b: Float64Array) => {
    const o = new Float64Array(9);
    for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) for (let k = 0; k < 3; k++) o[3 * r + c] += a[3 * r + k] * b[3 * k + c];
    return o;
  };
  const maxDiff = (a: ArrayLike<number>, b: ArrayLike<number>) => Math.max(...Array.from(a, (v, i) => Math.abs(v - b[i])));

  it("log inverts Rodrigues, also near 0 and near π", () => {
    const R = new Float64Array(9),
      v = new Float64Array(3);
    for (const t of [
      [0.1, 0.2, -0.3],
      [1e-10, -2e-10, 3e-10],
      [Math.PI - 1e-7, 0, 0],
      [0, 2.2, -2.1],
      [1.7, -1.1, 2.0],
    ]) {
      rotVec(t[0], t[1], t[2], R);
      logRotation(R, 0, v, 0);
      expect(maxDiff(v, t)).toBeLessThan(1e-6 * Math.max(1, Math.hypot(t[0], t[1], t[2])));
    }
  });

  it("R_shown = Rnom·exp(k·log(Rnomᵀ R)): k = 1 is the pose itself, k = 50 is fifty times the deviation", () => {
    const Rnom = rotVec(0.1, -0.4, 1.3, new Float64Array(9));
    const dev = [0.002, -0.003, 0.001];
    const R = mul(Rnom, rotVec(dev[0], dev[1], dev[2], new Float64Array(9)));
    const out = new Float64Array(9);
    exaggerateRotation(R, Rnom, 0, 1, out, 0);
    expect(maxDiff(out, R)).toBeLessThan(1e-14);
    exaggerateRotation(R, Rnom, 0, 50, out, 0);
    const expected = mul(Rnom, rotVec(50 * dev[0], 50 * dev[1], 50 * dev[2], new Float64Array(9)));
    expect(maxDiff(out, expected)).toBeLessThan(1e-12);
    exaggerateRotation(R, Rnom, 0, 0, out, 0);
    expect(maxDiff(out, Rnom)).toBeLessThan(1e-15);
  });

  it("a misaligned sensing axis turns k times further from its ideal axis", () => {
    const a = 0.004; // rad, y axis tipped toward z
    const u = new Float64Array([0, Math.cos(a), Math.sin(a)]);
    const out = new Float64Array(3);
    exaggerateDirection(u, 0, 1, 100, out, 0);
    expect(out[0]).toBeCloseTo(0, 14);
    expect(Math.atan2(out[2], out[1])).toBeCloseTo(100 * a, 12);
  });
});

describe("poses for the view", () => {
  const stack = StackFileSchema.parse(JSON.parse(readFileSync(join(ROOT, "tests/fixtures/stack-reference.json"), "utf8")));
  const study = StudyFileSchema.parse(JSON.parse(readFileSync(join(ROOT, "tests/fixtures/study-reference.json"), "utf8")));

  it("a regenerated trial is the engine's poseOfTrial, for random and Latin-hypercube sampling", () => {
    for (const s of [study, { ...study, sampling: "lhs" as const, trials: 5000 }]) {
      const vm = compileForViewer(stack, s);
      for (const trial of [0, 1348, 4999]) {
        const set = poseSet(vm, stack, trialDraws(vm, trial));
        const ref = poseOfTrial(stack, s, trial);
        ref.elements.forEach((e, i) => {
          expect(set.ids[i]).toBe(e.id);
          for (let k = 0; k < 9; k++) expect(set.R[9 * i + k]).toBe(e.R[k]);
          for (let k = 0; k < 3; k++) expect(set.P[3 * i + k]).toBe(e.position[k]);
        });
        expect(set.metrics[set.metricIds.indexOf("heading.maxAbsDeg")]).toBe(ref.metrics["heading.maxAbsDeg"]);
      }
    }
  });

  it("the local offsets rebuild the engine's positions, and the nominal pose has no tilt", () => {
    const vm = compileForViewer(stack, study);
    const set = poseSet(vm, stack, trialDraws(vm, 7));
    for (let i = 0; i < set.count; i++) {
      const q = set.parent[i];
      if (q < 0) continue;
      for (let r = 0; r < 3; r++) {
        const p =
          set.P[3 * q + r] +
          set.R[9 * q + 3 * r] * set.L[3 * i] +
          set.R[9 * q + 3 * r + 1] * set.L[3 * i + 1] +
          set.R[9 * q + 3 * r + 2] * set.L[3 * i + 2];
        expect(p).toBeCloseTo(set.P[3 * i + r], 12);
      }
    }
    const nominal = poseSet(compileForViewer(stack, undefined), stack, new Float64Array(vm.model.drawCount));
    expect(Math.max(...nominal.tiltDeg)).toBe(0);
  });
});

// ---------------------------------------------------------------- the browser

/** /fonts/* from the repository's fonts folder, as the server serves them in the app. */
function serveFonts(): Plugin {
  return {
    name: "viewer3d-test-fonts",
    configureServer(server) {
      server.middlewares.use("/fonts", (req, res, next) => {
        const name = (req.url ?? "").split("?")[0].replace(/^\/+/, "");
        const file = join(FONTS, name);
        if (!/^[\w.-]+$/.test(name) || !existsSync(file)) return next();
        res.setHeader("Content-Type", name.endsWith(".css") ? "text/css" : "font/woff2");
        res.end(readFileSync(file));
      });
    },
  };
}

type Stats = {
  width: number;
  height: number;
  gyro: number;
  accel: number;
  mag: number;
  centroids: Record<string, [number, number] | null>;
};

/**
 * Reads the WebGL canvas back through toDataURL and counts pixels by hue: the dies'
 * palette hues (gyro indigo 243°, accel teal 176°, mag vermilion 12°) within ±11°, with
 * enough saturation and brightness that lighting cannot make a grey pass.
 */
async function canvasStats(page: Page, snapshotName?: string): Promise<Stats> {
  return page.evaluate(async (name) => {
    const canvas = document.querySelector<HTMLCanvasElement>("[data-testid=stack-viewer-viewport] canvas");
    if (!canvas) throw new Error("no canvas");
    const url = canvas.toDataURL("image/png");
    const img = new Image();
    img.src = url;
    await img.decode();
    const c = document.createElement("canvas");
    c.width = img.width;
    c.height = img.height;
    const g = c.getContext("2d", { willReadFrequently: true })!;
    g.drawImage(img, 0, 0);
    const data = g.getImageData(0, 0, c.width, c.height);
    const w = window as unknown as { __snaps?: Record<string, ImageData> };
    w.__snaps ??= {};
    if (name) w.__snaps[name] = data;
    const targets = { gyro: 243, accel: 176, mag: 12 } as Record<string, number>;
    const counts: Record<string, number> = { gyro: 0, accel: 0, mag: 0 };
    const sums: Record<string, [number, number]> = { gyro: [0, 0], accel: [0, 0], mag: [0, 0] };
    const d = data.data;
    for (let p = 0; p < d.length; p += 4) {
      const r = d[p] / 255,
        gg = d[p + 1] / 255,
        b = d[p + 2] / 255;
      const max = Math.max(r, gg, b),
        min = Math.min(r, gg, b);
      const delta = max - min;
      if (max < 0.18 || delta / max < 0.5) continue;
      let h = max === r ? ((gg - b) / delta) % 6 : max === gg ? (b - r) / delta + 2 : (r - gg) / delta + 4;
      h *= 60;
      if (h < 0) h += 360;
      for (const k of Object.keys(targets)) {
        const dh = Math.abs(((h - targets[k] + 540) % 360) - 180);
        if (dh <= 11) {
          counts[k]++;
          const i = p / 4;
          sums[k][0] += i % c.width;
          sums[k][1] += Math.floor(i / c.width);
        }
      }
    }
    const centroids: Record<string, [number, number] | null> = {};
    for (const k of Object.keys(counts)) centroids[k] = counts[k] ? [sums[k][0] / counts[k], sums[k][1] / counts[k]] : null;
    return { width: c.width, height: c.height, gyro: counts.gyro, accel: counts.accel, mag: counts.mag, centroids };
  }, snapshotName ?? null);
}

/** Fraction of pixels whose largest channel difference exceeds 24 between two snapshots. */
async function pixelDifference(page: Page, a: string, b: string): Promise<number> {
  return page.evaluate(
    ([a, b]) => {
      const s = (window as unknown as { __snaps: Record<string, ImageData> }).__snaps;
      const x = s[a].data,
        y = s[b].data;
      if (x.length !== y.length) return 1;
      let changed = 0;
      for (let p = 0; p < x.length; p += 4) {
        if (Math.max(Math.abs(x[p] - y[p]), Math.abs(x[p + 1] - y[p + 1]), Math.abs(x[p + 2] - y[p + 2])) > 24) changed++;
      }
      return changed / (x.length / 4);
    },
    [a, b] as const,
  );
}

const frameCount = (page: Page) =>
  page.evaluate(() => Number(document.querySelector<HTMLElement>("[data-testid=stack-viewer]")?.dataset.frames ?? 0));

/** Waits until no new frame has been drawn for a moment and the camera is not gliding. */
async function settle(page: Page) {
  let last = await frameCount(page);
  for (let still = 0, i = 0; still < 2 && i < 200; i++) {
    await page.waitForTimeout(120);
    const f = await frameCount(page);
    const moving = await page.evaluate(() => document.querySelector<HTMLElement>("[data-testid=stack-viewer]")?.dataset.moving === "true");
    still = f === last && !moving ? still + 1 : 0;
    last = f;
  }
}

/** Runs an action that changes the picture, then waits for the new picture to be drawn. */
async function act(page: Page, action: () => Promise<unknown>) {
  const before = await frameCount(page);
  await action();
  await page.waitForFunction(
    (b) => {
      const el = document.querySelector<HTMLElement>("[data-testid=stack-viewer]");
      return !!el && Number(el.dataset.frames) > b && el.dataset.moving === "false";
    },
    before,
    { polling: 50, timeout: 30_000 },
  );
  await settle(page);
}

async function shot(page: Page, name: string) {
  mkdirSync(ARTIFACTS, { recursive: true });
  await page.screenshot({ path: join(ARTIFACTS, `${name}.png`) });
}

describe("3D view in the browser", () => {
  let server: ViteDevServer;
  let browser: Browser;
  let page: Page;
  let baseURL: string;
  const problems: string[] = [];

  beforeAll(async () => {
    const t0 = Date.now();
    const mark = (what: string) => process.env.VIEWER3D_TIMING && process.stderr.write(`[viewer3d] ${what} ${Date.now() - t0} ms\n`);
    server = await createServer({
      configFile: join(ROOT, "vite.config.ts"),
      root: HARNESS,
      cacheDir: join(tmpdir(), "orthostack-viewer3d-vite"),
      logLevel: "error",
      clearScreen: false,
      plugins: [serveFonts()],
      server: { port: 0, host: "127.0.0.1", strictPort: false, hmr: false, watch: null },
      optimizeDeps: {
        entries: [join(HARNESS, "index.html")],
        include: ["three", "@react-three/fiber", "@react-three/drei", "react", "react-dom/client", "react/jsx-dev-runtime", "zod"],
      },
    });
    await server.listen();
    const address = server.httpServer?.address();
    if (!address || typeof address === "string") throw new Error("vite did not listen on a port");
    baseURL = `http://127.0.0.1:${address.port}`;
    browser = await chromium.launch({
      executablePath: "/usr/bin/chromium",
      headless: true,
      args: [
        "--no-sandbox",
        "--disable-gpu",
        "--disable-quic",
        "--no-first-run",
        "--disable-background-networking",
        "--disable-component-update",
        "--disable-sync",
        "--use-angle=swiftshader",
        "--enable-unsafe-swiftshader",
      ],
    });
    const context = await browser.newContext({ viewport: { width: 1120, height: 720 }, deviceScaleFactor: 1, acceptDownloads: true });
    page = await context.newPage();
    page.setDefaultTimeout(30_000);
    page.on("pageerror", (e) => problems.push(`page error: ${e.message}`));
    page.on("console", (m) => {
      if (m.type() === "error") problems.push(`console error: ${m.text()}`);
    });
    mark("browser up");
    await page.goto(baseURL + "/");
    await page.waitForSelector("[data-testid=viewer-loading], [data-testid=stack-viewer]", { timeout: 60_000 });
    mark("harness up");
    await page.waitForSelector("[data-testid=stack-viewer][data-frames]", { timeout: 60_000 });
    mark("first frame");
    await settle(page);
    mark("settled");
    await page.evaluate(() => document.fonts.ready);
  });

  afterAll(async () => {
    await browser?.close();
    await server?.close();
  });

  it("draws the dies to scale in their palette colours", async () => {
    await shot(page, "viewer3d-nominal");
    const s = await canvasStats(page, "nominal");
    expect(s.width).toBeGreaterThan(600);
    // each die is clearly visible in its own hue (the package is framed, not the board)
    expect(s.gyro).toBeGreaterThan(800);
    expect(s.accel).toBeGreaterThan(800);
    expect(s.mag).toBeGreaterThan(800);
    expect(await page.getByTestId("pose-label").textContent()).toContain("Nominal pose");
    expect(await page.getByTestId("viewer-legend").textContent()).toMatch(/Gyroscope.*Accelerometer.*Magnetometer/);
  });

  it("names an element on hover and selects it on click", async () => {
    const s = await canvasStats(page);
    const box = (await page.locator("[data-testid=stack-viewer-viewport] canvas").boundingBox())!;
    const [mx, my] = s.centroids.mag!;
    await act(page, () => page.mouse.move(box.x + mx, box.y + my));
    const tip = page.getByTestId("viewer-tooltip");
    expect(await tip.isVisible()).toBe(true);
    const text = await tip.textContent();
    expect(text).toContain("Magnetometer");
    expect(text).toMatch(/0\.90 × 0\.50 × 0\.15 mm/);
    await shot(page, "viewer3d-hover-mag");
    await act(page, () => page.mouse.click(box.x + mx, box.y + my));
    expect(await page.getByTestId("harness-selected").textContent()).toBe("mag");
    // around the package lies the board, which names itself too
    await act(page, () => page.mouse.move(box.x + box.width * 0.72, box.y + box.height - 30));
    expect(await tip.textContent()).toContain("Board");
    await act(page, () => page.mouse.move(box.x + box.width / 2, box.y - 30));
    expect(await tip.isVisible()).toBe(false);
    await shot(page, "viewer3d-selected-mag");
  });

  it("shows the worst trial, regenerated from the seed, and its picture differs from nominal", async () => {
    const worst = JSON.parse((await page.getByTestId("harness-worst").textContent())!) as {
      metric: string;
      trialIndex: number;
      value: number;
    }[];
    const heading = worst.find((w) => w.metric === "heading.maxAbsDeg")!;
    await act(page, () => page.getByLabel("Pose", { exact: true }).selectOption(`worst:${worst.indexOf(heading)}`));
    expect(await page.getByTestId("harness-trial").textContent()).toBe(String(heading.trialIndex));
    expect(await page.getByTestId("stack-viewer").getAttribute("data-pose")).toBe(`trial:${heading.trialIndex}`);
    // picking a worst trial starts at a visible exaggeration
    expect(await page.getByTestId("exaggeration-value").textContent()).toBe("×50");
    expect(await page.getByTestId("pose-label").textContent()).toContain("worst heading.maxAbsDeg");
    expect(await page.getByTestId("recomputed").textContent()).toContain(
      "Regenerated from the seed: heading.maxAbsDeg = " + heading.value.toFixed(2),
    );
    await shot(page, "viewer3d-worst-heading-x50");
    await canvasStats(page, "worst50");
    expect(await pixelDifference(page, "nominal", "worst50")).toBeGreaterThan(0.004);
  });

  it("the exaggeration control scales the deviations", async () => {
    await act(page, () => page.getByRole("button", { name: "×200" }).click());
    expect(await page.getByTestId("exaggeration-value").textContent()).toBe("×200");
    await shot(page, "viewer3d-worst-heading-x200");
    await canvasStats(page, "worst200");
    await act(page, () => page.getByLabel("Angle exaggeration").fill("0"));
    expect(await page.getByTestId("stack-viewer").getAttribute("data-exaggeration")).toBe("1");
    await canvasStats(page, "worst1");
    expect(await pixelDifference(page, "worst200", "worst1")).toBeGreaterThan(0.004);
    expect(await pixelDifference(page, "worst50", "worst200")).toBeGreaterThan(0.002);
    // the slider is logarithmic: its middle is about ×14
    await act(page, () => page.getByLabel("Angle exaggeration").fill("50"));
    expect(await page.getByTestId("exaggeration-value").textContent()).toBe("×14");
  });

  it("shows any trial by index", async () => {
    const field = page.getByLabel("Trial index");
    await field.fill("1234");
    await act(page, () => field.press("Enter"));
    expect(await page.getByTestId("stack-viewer").getAttribute("data-pose")).toBe("trial:1234");
    expect(await page.getByTestId("harness-trial").textContent()).toBe("1234");
    await act(page, () => page.getByRole("button", { name: "Next trial" }).click());
    expect(await page.getByTestId("harness-trial").textContent()).toBe("1235");
    await canvasStats(page, "trial1235");
    // still at ×14 from the slider: another trial, another picture
    expect(await pixelDifference(page, "worst50", "trial1235")).toBeGreaterThan(0.001);
  });

  it("has view presets, including the whole board", async () => {
    await act(page, () => page.getByRole("button", { name: "Side", exact: true }).click());
    await shot(page, "viewer3d-side");
    await act(page, () => page.getByRole("button", { name: "Top", exact: true }).click());
    await shot(page, "viewer3d-top");
    await canvasStats(page, "top");
    await act(page, () => page.getByRole("button", { name: "Whole board" }).click());
    await shot(page, "viewer3d-board");
    const board = await canvasStats(page, "board");
    expect(await pixelDifference(page, "top", "board")).toBeGreaterThan(0.05);
    // the dies are small on the whole board, but still there
    expect(board.mag).toBeGreaterThan(0);
    await act(page, () => page.getByRole("button", { name: "Package" }).click());
  });

  it("explodes the stack and cuts it with a section plane", async () => {
    await act(page, () => page.getByLabel("Pose", { exact: true }).selectOption("nominal"));
    expect(await page.getByTestId("harness-trial").textContent()).toBe("nominal");
    await act(page, () => page.getByLabel("Explode gap (mm)").fill("0.4"));
    await canvasStats(page, "exploded");
    expect(await pixelDifference(page, "nominal", "exploded")).toBeGreaterThan(0.01);
    await act(page, () => page.getByRole("button", { name: "Package" }).click());
    await shot(page, "viewer3d-exploded");
    await canvasStats(page, "exploded-framed");
    await act(page, () => page.getByRole("button", { name: "x cut" }).click());
    await shot(page, "viewer3d-exploded-section-x");
    await canvasStats(page, "section");
    expect(await pixelDifference(page, "exploded-framed", "section")).toBeGreaterThan(0.005);
  });

  it("outlines an element with a geometry warning in the warning colour and says so", async () => {
    // the pointer leaves the view first, so no hover changes the picture meanwhile
    await page.getByTestId("harness-flag").hover();
    await settle(page);
    await canvasStats(page, "unflagged");
    await act(page, () => page.getByTestId("harness-flag").click());
    expect(await page.getByTestId("viewer-geometry-warnings").textContent()).toMatch(/Geometry warning on gyro: outlined in amber/);
    await shot(page, "viewer3d-warning-gyro");
    await canvasStats(page, "flagged");
    // the gyro's outline changes colour: a thin line, some hundreds of pixels
    expect(await pixelDifference(page, "unflagged", "flagged")).toBeGreaterThan(0.0002);
    await act(page, () => page.getByTestId("harness-flag").click());
    expect(await page.getByTestId("viewer-geometry-warnings").count()).toBe(0);
    await canvasStats(page, "cleared");
    expect(await pixelDifference(page, "unflagged", "cleared")).toBeLessThan(0.0001);
  });

  it("saves a picture of the view at twice its pixels, the caption inside it", async () => {
    const canvasSize = () =>
      page.evaluate(() => {
        const c = document.querySelector<HTMLCanvasElement>('[data-testid="stack-viewer"] canvas')!;
        return [c.width, c.height];
      });
    const [w, h] = await canvasSize();
    const [download] = await Promise.all([page.waitForEvent("download"), page.getByRole("button", { name: "Save picture" }).click()]);
    expect(download.suggestedFilename()).toMatch(/^reference-9-axis-stack-revision-3-nominal-x\d+\.png$/);
    const path = join(ARTIFACTS, "viewer3d-export.png");
    await download.saveAs(path);
    const bytes = readFileSync(path);
    expect(bytes.subarray(1, 4).toString("latin1")).toBe("PNG");
    // the IHDR chunk: width and height of the picture, twice those of the view's drawing buffer
    expect([bytes.readUInt32BE(16), bytes.readUInt32BE(20)]).toEqual([2 * w, 2 * h]);
    // the view on the page is back at its own size
    expect(await canvasSize()).toEqual([w, h]);
    // the caption band at the foot of the picture holds light text on the dark band
    const band = await page.evaluate(
      async (dataUrl) => {
        const img = new Image();
        img.src = dataUrl;
        await img.decode();
        const c = document.createElement("canvas");
        c.width = img.width;
        c.height = img.height;
        const g = c.getContext("2d")!;
        g.drawImage(img, 0, 0);
        const rows = Math.round(img.height * 0.06);
        const d = g.getImageData(0, img.height - rows, img.width, rows).data;
        let light = 0;
        for (let i = 0; i < d.length; i += 4) if (d[i] > 150 && d[i + 1] > 150 && d[i + 2] > 150) light++;
        return light / (d.length / 4);
      },
      `data:image/png;base64,${bytes.toString("base64")}`,
    );
    expect(band).toBeGreaterThan(0.005);
    expect(band).toBeLessThan(0.5);
    writeFileSync(join(ARTIFACTS, "viewer3d-problems.txt"), problems.join("\n"));
    expect(problems).toEqual([]);
  });
});
