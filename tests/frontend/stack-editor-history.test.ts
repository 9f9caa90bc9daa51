import { describe, expect, it } from "vitest";
import {
  canRedo,
  canUndo,
  COALESCE_MS,
  createHistory,
  HISTORY_LIMIT,
  historyReducer,
  type History,
} from "@frontend/features/stack-editor/lib/history";

type H = History<{ v: number }>;
const edit = (h: H, v: number, key?: string, at = 0) => historyReducer(h, { type: "edit", next: { v }, key, at });

describe("the editor's undo history", () => {
  it("undoes and redoes edits in order, and a new edit drops the redo branch", () => {
    let h: H = createHistory({ v: 0 });
    h = edit(h, 1, "a", 0);
    h = edit(h, 2, "b", 10);
    h = edit(h, 3, "c", 20);
    expect(h.present.v).toBe(3);
    h = historyReducer(h, { type: "undo" });
    h = historyReducer(h, { type: "undo" });
    expect(h.present.v).toBe(1);
    expect(canRedo(h)).toBe(true);
    h = historyReducer(h, { type: "redo" });
    expect(h.present.v).toBe(2);
    h = edit(h, 9, "d", 30);
    expect(canRedo(h)).toBe(false);
    expect(h.past.map((d) => d.v)).toEqual([0, 1, 2]);
  });

  it("makes one step of typing into one field, but not across fields or after a pause", () => {
    let h: H = createHistory({ v: 0 });
    h = edit(h, 1, "mag.tol", 0);
    h = edit(h, 12, "mag.tol", 300);
    h = edit(h, 125, "mag.tol", 600);
    expect(h.past.map((d) => d.v)).toEqual([0]);
    h = edit(h, 7, "other", 700);
    expect(h.past.map((d) => d.v)).toEqual([0, 125]);
    h = edit(h, 8, "other", 700 + COALESCE_MS + 1);
    expect(h.past.map((d) => d.v)).toEqual([0, 125, 7]);
    // undo ends the run: the next edit with the same key is its own step
    h = historyReducer(h, { type: "undo" });
    h = edit(h, 9, "other", 700 + COALESCE_MS + 2);
    expect(h.past.map((d) => d.v)).toEqual([0, 125, 7]);
    expect(h.present.v).toBe(9);
    h = historyReducer(h, { type: "undo" });
    expect(h.present.v).toBe(7);
  });

  it("ignores an edit that changes nothing, and undo/redo at the ends", () => {
    const start: H = createHistory({ v: 0 });
    expect(historyReducer(start, { type: "edit", next: start.present })).toBe(start);
    expect(historyReducer(start, { type: "undo" })).toBe(start);
    expect(historyReducer(start, { type: "redo" })).toBe(start);
    expect(canUndo(start)).toBe(false);
  });

  it("keeps at most HISTORY_LIMIT steps", () => {
    let h: H = createHistory({ v: 0 });
    for (let i = 1; i <= HISTORY_LIMIT + 25; i++) h = edit(h, i, undefined, i);
    expect(h.past.length).toBe(HISTORY_LIMIT);
    expect(h.past[0].v).toBe(25);
  });

  it("reset starts a fresh history", () => {
    let h: H = edit(createHistory({ v: 0 }), 1, "a");
    h = historyReducer(h, { type: "reset", present: { v: 5 } });
    expect(h).toEqual(createHistory({ v: 5 }));
  });
});
