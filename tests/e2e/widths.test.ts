/**
 * Every main page at three laptop widths (1024, 1280, 1440 px): projects, a project, the stack
 * editor, a study, the reports list, a report, new study settings, what-if (its three tabs),
 * compare, a data set and suppliers; as an admin, members, outbox, server status and account.
 * A screenshot of each into tests/e2e/.artifacts/ and a check, in the page, that no text is cut
 * off by a box that hides its overflow or drawn over other text. One browser context per user;
 * the window is resized between widths.
 *
 * What counts as cut off (see `clippedText` below):
 * - a text node whose drawn box reaches past an ancestor that hides overflow (overflow hidden
 *   or clip, or an <svg> root, which clips by default), up to the nearest scrolling box (text
 *   inside a scroll area can be scrolled to, so the search stops there);
 * - a select whose chosen option is wider than the select's text area, an input whose value
 *   is wider than the input;
 * - the main area wider than the window (the page would scroll sideways);
 * - two pieces of text drawn over each other (`overlappingText`: their visible line boxes
 *   cover each other), which a clipping box does not show.
 * Intentional truncation is allowed only when the whole text can still be read: an element
 * between the text and the clipping box carries a `title` (or `aria-label`) holding the text.
 * Visually hidden text for screen readers (a 1 px clipped box) is not drawn and is skipped.
 */
import type { Page } from "playwright-core";
import { describe, expect, it } from "vitest";
import { screenshot as viewportShot, signInAs } from "./support/browser";
import { setupE2E, unexpectedProblems } from "./support/setup";

const e2e = setupE2E();

const WIDTHS = [1024, 1280, 1440] as const;
const HEIGHT = 900;

/** Runs in the page: a list of readable descriptions of text that is cut off. */
function clippedText(): string[] {
  const found: string[] = [];
  const SLACK = 1.5; // sub-pixel rounding of text boxes
  const label = (el: Element) => {
    const cls = typeof el.className === "string" ? el.className.split(/\s+/).slice(0, 4).join(".") : "";
    return `<${el.tagName.toLowerCase()}${cls ? "." + cls : ""}>`;
  };
  const hidden = (el: Element) => {
    const r = el.getBoundingClientRect();
    return r.width <= 1 && r.height <= 1;
  };
  /** An element from `from` up to and including `to` whose title or aria-label holds the text. */
  const titled = (from: Element, to: Element, text: string) => {
    const want = text.replace(/\s+/g, " ").trim();
    for (let el: Element | null = from; el; el = el.parentElement) {
      for (const attr of ["title", "aria-label"]) {
        const v = el.getAttribute(attr)?.replace(/\s+/g, " ").trim();
        if (v && v.includes(want)) return true;
      }
      if (el === to) break;
    }
    return false;
  };

  // 1. text nodes against the boxes that clip them
  const walker = document.createTreeWalker(document.body, NodeFilter.SHOW_TEXT);
  const range = document.createRange();
  for (let node = walker.nextNode(); node; node = walker.nextNode()) {
    const text = node.textContent ?? "";
    if (!text.trim()) continue;
    const parent = node.parentElement;
    if (!parent || parent.closest("script, style, noscript, option, title")) continue;
    const style = getComputedStyle(parent);
    if (style.visibility === "hidden" || style.display === "none") continue;
    range.selectNodeContents(node);
    const box = range.getBoundingClientRect();
    if (box.width === 0 || box.height === 0) continue;
    for (let anc: Element | null = parent; anc && anc !== document.documentElement; anc = anc.parentElement) {
      const s = getComputedStyle(anc);
      if (hidden(anc)) break; // screen-reader-only text
      const scrolls = [s.overflowX, s.overflowY].some((o) => o === "auto" || o === "scroll");
      const clipsX = s.overflowX === "hidden" || s.overflowX === "clip" || (anc.tagName === "svg" && s.overflowX !== "visible");
      const clipsY = s.overflowY === "hidden" || s.overflowY === "clip" || (anc.tagName === "svg" && s.overflowY !== "visible");
      if (clipsX || clipsY) {
        const r = anc.getBoundingClientRect();
        const over = Math.max(
          clipsX ? r.left - box.left : 0,
          clipsX ? box.right - r.right : 0,
          clipsY ? r.top - box.top : 0,
          clipsY ? box.bottom - r.bottom : 0,
        );
        if (over > SLACK && !titled(parent, anc, text)) {
          found.push(`"${text.trim().slice(0, 60)}" in ${label(parent)} cut by ${label(anc)} by ${Math.round(over)} px`);
          break;
        }
      }
      if (scrolls) break;
    }
  }

  // 2. form controls: the chosen option of a select, the value of an input
  const canvas = document.createElement("canvas").getContext("2d")!;
  for (const select of document.querySelectorAll("select")) {
    if (hidden(select) || select.multiple || select.size > 1) continue;
    const chosen = select.selectedOptions[0]?.text ?? "";
    if (!chosen.trim()) continue;
    const s = getComputedStyle(select);
    canvas.font = `${s.fontStyle} ${s.fontWeight} ${s.fontSize} ${s.fontFamily}`;
    const need = canvas.measureText(chosen).width;
    // the text area: the inner width less the padding (the right padding holds the arrow)
    const room = select.clientWidth - parseFloat(s.paddingLeft) - parseFloat(s.paddingRight);
    if (need > room + SLACK && !titled(select, select, chosen)) {
      found.push(`select "${chosen.slice(0, 60)}" needs ${Math.round(need)} px, has ${Math.round(room)} px`);
    }
  }
  for (const input of document.querySelectorAll<HTMLInputElement>("input[type=text], input[type=number], input:not([type])")) {
    if (hidden(input) || !input.value) continue;
    if (input.scrollWidth > input.clientWidth + SLACK && !titled(input, input, input.value)) {
      found.push(
        `input "${input.value.slice(0, 60)}" (${input.name || input.id || input.getAttribute("aria-label")}) overflows by ${input.scrollWidth - input.clientWidth} px`,
      );
    }
  }

  // 3. the page itself must not scroll sideways
  const main = document.querySelector("main");
  for (const el of [document.documentElement, main]) {
    if (el && el.scrollWidth > el.clientWidth + SLACK) {
      // name the innermost boxes that reach past the right edge, so the cause can be found
      const edge = el.getBoundingClientRect().right;
      const past = [...el.querySelectorAll("*")].filter(
        (x) =>
          x.getBoundingClientRect().right > edge + SLACK && ![...x.children].some((c) => c.getBoundingClientRect().right > edge + SLACK),
      );
      found.push(
        `${label(el)} is ${el.scrollWidth - el.clientWidth} px wider than the window (past its edge: ${past
          .slice(0, 3)
          .map(label)
          .join(", ")})`,
      );
    }
  }
  return found;
}

/**
 * Runs in the page: pairs of text nodes drawn over each other. Each text node's line boxes
 * (one per line, from a Range) are cut to what its clipping and scrolling ancestors let show,
 * so text scrolled out of a list or hidden by a clipping box does not count. Two boxes of
 * different text nodes count as overlapping when they share more than 2 px across and more
 * than 40 % of the shorter one's height (tight line heights make the lines of one paragraph
 * touch by a pixel or two, which is not a collision). Text with opacity 0 or in a hidden box
 * is skipped; the 1 px boxes of screen-reader text are not drawn.
 */
function overlappingText(): string[] {
  type Box = { l: number; t: number; r: number; b: number; text: string; el: Element; node: Node };
  const boxes: Box[] = [];
  const clipOf = new Map<Element, { l: number; t: number; r: number; b: number } | null>();
  /** the part of the window an element's content can show in, after every ancestor that clips or scrolls */
  const visibleArea = (el: Element): { l: number; t: number; r: number; b: number } | null => {
    if (clipOf.has(el)) return clipOf.get(el)!;
    const parent = el.parentElement;
    let area: { l: number; t: number; r: number; b: number } | null = parent ? visibleArea(parent) : { l: -1e9, t: -1e9, r: 1e9, b: 1e9 };
    const s = getComputedStyle(el);
    if (s.display === "none" || s.visibility === "hidden" || s.opacity === "0") area = null;
    else if (area && (s.overflowX !== "visible" || s.overflowY !== "visible" || el.tagName === "svg")) {
      const r = el.getBoundingClientRect();
      if (r.width <= 1 && r.height <= 1) area = null;
      else {
        const cx = s.overflowX !== "visible" || el.tagName === "svg";
        const cy = s.overflowY !== "visible" || el.tagName === "svg";
        area = {
          l: cx ? Math.max(area.l, r.left) : area.l,
          r: cx ? Math.min(area.r, r.right) : area.r,
          t: cy ? Math.max(area.t, r.top) : area.t,
          b: cy ? Math.min(area.b, r.bottom) : area.b,
        };
        if (area.r <= area.l || area.b <= area.t) area = null;
      }
    }
    clipOf.set(el, area);
    return area;
  };
  const walker = document.createTreeWalker(document.body, NodeFilter.SHOW_TEXT);
  const range = document.createRange();
  for (let node = walker.nextNode(); node; node = walker.nextNode()) {
    const text = node.textContent ?? "";
    if (!text.trim()) continue;
    const parent = node.parentElement;
    if (!parent || parent.closest("script, style, noscript, option, title")) continue;
    const area = visibleArea(parent);
    if (!area) continue;
    range.selectNodeContents(node);
    for (const rect of range.getClientRects()) {
      const box = {
        l: Math.max(rect.left, area.l),
        r: Math.min(rect.right, area.r),
        t: Math.max(rect.top, area.t),
        b: Math.min(rect.bottom, area.b),
      };
      if (box.r - box.l < 1 || box.b - box.t < 1) continue;
      boxes.push({ ...box, text: text.trim(), el: parent, node });
    }
  }
  boxes.sort((a, b) => a.t - b.t);
  const out: string[] = [];
  const seen = new Set<string>();
  for (let i = 0; i < boxes.length; i++) {
    const a = boxes[i];
    for (let j = i + 1; j < boxes.length && boxes[j].t < a.b; j++) {
      const b = boxes[j];
      if (a.node === b.node) continue;
      const across = Math.min(a.r, b.r) - Math.max(a.l, b.l);
      const down = Math.min(a.b, b.b) - Math.max(a.t, b.t);
      if (across > 2 && down > 0.4 * Math.min(a.b - a.t, b.b - b.t)) {
        const key = `"${a.text.slice(0, 40)}" and "${b.text.slice(0, 40)}"`;
        if (seen.has(key)) continue;
        seen.add(key);
        out.push(`${key} drawn over each other (${Math.round(across)} × ${Math.round(down)} px)`);
      }
    }
  }
  return out;
}

type Visit = { name: string; path: string; ready: (page: Page) => Promise<void> };

async function api<T>(page: Page, method: string, path: string, body?: unknown): Promise<T> {
  return page.evaluate(
    async ([m, p, b]) => {
      const res = await fetch(p as string, {
        method: m as string,
        headers: b === undefined ? {} : { "content-type": "application/json" },
        body: b === undefined ? undefined : JSON.stringify(b),
      });
      if (!res.ok) throw new Error(`${m} ${p}: ${res.status} ${await res.text()}`);
      return res.json();
    },
    [method, path, body] as const,
  ) as Promise<T>;
}

async function demoIds(page: Page) {
  const { projects } = await api<{ projects: Array<{ id: string; name: string }> }>(page, "GET", "/api/projects");
  const project = projects.find((p) => /Ridgeline/.test(p.name))!;
  const { revisions } = await api<{ revisions: Array<{ id: string; status: string }> }>(
    page,
    "GET",
    `/api/projects/${project.id}/revisions`,
  );
  const draft = revisions.find((r) => r.status === "draft")!;
  const end = Date.now() + 150_000;
  let studyId = "";
  while (!studyId) {
    const { studies } = await api<{ studies: Array<{ id: string; status: string }> }>(page, "GET", `/api/projects/${project.id}/studies`);
    studyId = studies.find((s) => s.status === "finished")?.id ?? "";
    if (!studyId && Date.now() > end) throw new Error("the demo study did not finish");
    if (!studyId) await page.waitForTimeout(1000);
  }
  const { suppliers } = await api<{ suppliers: Array<{ id: string; name: string }> }>(page, "GET", "/api/suppliers");
  const larkfield = suppliers.find((s) => s.name === "Larkfield Assembly")!;
  const report = await api<{ id: string }>(page, "POST", `/api/studies/${studyId}/reports`, { supplierId: larkfield.id });
  const { datasets } = await api<{ datasets: Array<{ id: string }> }>(page, "GET", `/api/projects/${project.id}/datasets`);
  return { projectId: project.id, draftId: draft.id, studyId, reportId: report.id, datasetId: datasets[0]?.id };
}

/** The whole of <main> in the picture: the app scrolls inside it, so the window grows for the shot. */
async function screenshot(page: Page, name: string) {
  const size = page.viewportSize()!;
  const height = await page.evaluate(() => document.querySelector("main")?.scrollHeight ?? 0);
  if (height + 60 > size.height) {
    await page.setViewportSize({ width: size.width, height: Math.min(height + 60, 6000) });
    await page.waitForTimeout(400); // charts re-measure their boxes
  }
  await viewportShot(page, name);
  await page.setViewportSize(size);
}

describe("pages at 1024, 1280 and 1440 px", () => {
  it("show every name whole at each width", async () => {
    const { page, problems } = await e2e.session();
    await signInAs(page, "engineer@example.com");
    const ids = await demoIds(page);

    const visits: Visit[] = [
      { name: "projects", path: "/projects", ready: (p) => p.getByRole("table", { name: "Projects" }).waitFor() },
      {
        name: "project",
        path: `/projects/${ids.projectId}`,
        ready: (p) => p.getByRole("table", { name: "Stack revisions" }).waitFor(),
      },
      {
        name: "stack-editor",
        path: `/projects/${ids.projectId}/revisions/${ids.draftId}`,
        ready: async (p) => {
          await p.getByRole("tree", { name: "Elements" }).waitFor();
          await p.waitForFunction(
            () => /^Updated in/.test(document.querySelector('[data-testid="estimate-status"]')?.textContent?.trim() ?? ""),
            undefined,
            {
              timeout: 30_000,
            },
          );
          await p.locator("canvas").first().waitFor({ timeout: 30_000 });
        },
      },
      {
        name: "study",
        path: `/projects/${ids.projectId}/studies/${ids.studyId}`,
        ready: (p) => p.getByRole("list", { name: "Requirements" }).waitFor({ timeout: 30_000 }),
      },
      {
        name: "reports",
        path: "/reports",
        ready: (p) =>
          p
            .getByRole("link", { name: /TR-0001/ })
            .first()
            .waitFor(),
      },
      { name: "report", path: `/reports/${ids.reportId}`, ready: (p) => p.getByRole("heading", { name: "TR-0001 revision 1" }).waitFor() },
      {
        name: "study-settings",
        path: `/projects/${ids.projectId}/studies/new`,
        ready: (p) => p.getByRole("heading", { name: "New study" }).waitFor(),
      },
      {
        name: "what-if",
        path: `/projects/${ids.projectId}/what-if?study=${ids.studyId}`,
        ready: (p) => p.getByRole("heading", { name: "What if" }).waitFor(),
      },
      {
        name: "what-if-allocation",
        path: `/projects/${ids.projectId}/what-if?study=${ids.studyId}&tab=allocation`,
        ready: (p) => p.getByRole("heading", { name: "What if" }).waitFor(),
      },
      {
        name: "what-if-map",
        path: `/projects/${ids.projectId}/what-if?study=${ids.studyId}&tab=map`,
        ready: (p) => p.getByRole("heading", { name: "What if" }).waitFor(),
      },
      {
        name: "compare",
        path: `/projects/${ids.projectId}/compare?a=${ids.studyId}`,
        ready: (p) => p.getByRole("heading", { name: "Compare studies" }).waitFor(),
      },
      ...(ids.datasetId
        ? [
            {
              name: "dataset",
              path: `/projects/${ids.projectId}/datasets/${ids.datasetId}`,
              ready: (p: Page) => p.getByText("Columns and mapping").first().waitFor(),
            },
          ]
        : []),
      { name: "suppliers", path: "/suppliers", ready: (p) => p.getByRole("heading", { name: "Suppliers" }).waitFor() },
    ];
    expect(ids.datasetId, "the demo project has a data set").toBeTruthy();

    // The checks themselves catch what they look for: a label planted over another and a name
    // in a box too narrow for it are reported; a paragraph's own lines and a title-excused cut are not.
    await page.goto("/projects");
    await visits[0].ready(page);
    await page.evaluate(() => {
      const probe = document.createElement("div");
      probe.id = "width-check-probe";
      probe.style.cssText = "width:400px;font:13px sans-serif";
      probe.innerHTML =
        '<div style="position:relative;height:20px"><span>Left label here</span><span style="position:absolute;left:40px;top:2px">Second label</span></div>' +
        '<div style="width:60px;overflow:hidden;white-space:nowrap"><span>A name far too long for its box</span></div>' +
        '<div style="width:60px;overflow:hidden;white-space:nowrap" title="Cut on purpose, with a title"><span>Cut on purpose, with a title</span></div>' +
        '<p style="width:120px;line-height:1.05">A paragraph of several words wrapping over lines</p>';
      // at the end of the page's own flow, clear of the app's text
      document.querySelector("main")!.append(probe);
    });
    const planted = [...(await page.evaluate(clippedText)), ...(await page.evaluate(overlappingText))].filter((f) =>
      /Left label|Second label|far too long|Cut on purpose|paragraph/.test(f),
    );
    expect(planted).toEqual([
      expect.stringMatching(/^"A name far too long for its box" in <span> cut by <div> by \d+ px$/),
      expect.stringMatching(/^"Left label here" and "Second label" drawn over each other/),
    ]);
    await page.evaluate(() => document.getElementById("width-check-probe")?.remove());

    const failures = await checkPages(page, visits);

    // the admin's own pages
    const admin = await e2e.session();
    await signInAs(admin.page, "admin@example.com");
    const adminVisits: Visit[] = [
      { name: "members", path: "/members", ready: (p) => p.getByRole("heading", { name: "Members", level: 1 }).waitFor() },
      { name: "outbox", path: "/outbox", ready: (p) => p.getByRole("heading", { name: "Outbox", level: 1 }).waitFor() },
      { name: "status", path: "/status", ready: (p) => p.getByRole("heading", { name: "Server status", level: 1 }).waitFor() },
      { name: "account", path: "/account", ready: (p) => p.getByRole("heading", { name: "Your account", level: 1 }).waitFor() },
    ];
    failures.push(...(await checkPages(admin.page, adminVisits)));
    expect(failures).toEqual([]);
    expect(unexpectedProblems(problems)).toEqual([]);
    expect(unexpectedProblems(admin.problems)).toEqual([]);
  }, 480_000); // the demo study may still be running at the start; 17 pages × 3 widths with pictures
});

/** Each page at each width: what is cut off or drawn over other text, and a picture. */
async function checkPages(page: Page, visits: Visit[]): Promise<string[]> {
  const failures: string[] = [];
  for (const visit of visits) {
    await page.setViewportSize({ width: WIDTHS[0], height: HEIGHT });
    await page.goto(visit.path);
    await visit.ready(page);
    for (const width of WIDTHS) {
      await page.setViewportSize({ width, height: HEIGHT });
      await page.evaluate(() => document.fonts.ready);
      await page.waitForTimeout(300); // resize observers (charts, the 3D view) settle
      for (const f of new Set(await page.evaluate(clippedText))) failures.push(`${visit.name} @ ${width}: ${f}`);
      for (const f of await page.evaluate(overlappingText)) failures.push(`${visit.name} @ ${width}: ${f}`);
      await screenshot(page, `width-${visit.name}-${width}`);
    }
  }
  return failures;
}
