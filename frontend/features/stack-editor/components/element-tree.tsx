/**
 * The element tree, board at the root, each element under the one it sits on, siblings
 * in file order. Its toolbar acts on the selected element: put a die or spacer on it,
 * move it onto another element, move it up or down among its siblings, remove it.
 */
import { useEffect, useMemo, useRef, useState, type KeyboardEvent } from "react";
import type { ElementKind } from "@shared/schemas/stack-file";
import { Button, IconButton } from "@frontend/components/ui/button";
import { PlusIcon, TrashIcon } from "@frontend/components/ui/icons";
import { cn } from "@frontend/lib/cn";
import { KIND_COLOR, KIND_NAME, KIND_SHORT } from "../lib/kinds";
import { ADDABLE_KINDS, addElement, moveElement, moveTargets, removeElement, reorderElement, treeRows } from "../lib/stack-ops";
import { useEditor } from "./editor-context";
import { SelectInput } from "./fields";

const ArrowIcon = ({ dir }: { dir: "up" | "down" }) => (
  <svg
    width="14"
    height="14"
    viewBox="0 0 16 16"
    fill="none"
    stroke="currentColor"
    strokeWidth="1.5"
    strokeLinecap="round"
    strokeLinejoin="round"
    aria-hidden="true"
  >
    {dir === "up" ? <path d="M8 13V3M4 7l4-4 4 4" /> : <path d="M8 3v10M4 9l4 4 4-4" />}
  </svg>
);

export function ElementTree() {
  const { doc, issues, selectedId, select, update, readOnly, warnings } = useEditor();
  const rows = useMemo(() => treeRows(doc.stack), [doc.stack]);
  const selected = rows.find((r) => r.id === selectedId) ?? null;
  const listRef = useRef<HTMLUListElement>(null);
  const [menu, setMenu] = useState(false);
  const menuRef = useRef<HTMLDivElement>(null);

  useEffect(() => {
    if (!menu) return;
    const close = (e: MouseEvent) => {
      if (!menuRef.current?.contains(e.target as Node)) setMenu(false);
    };
    document.addEventListener("mousedown", close);
    return () => document.removeEventListener("mousedown", close);
  }, [menu]);

  const add = (kind: ElementKind) => {
    if (!selected) return;
    setMenu(false);
    // addElement is deterministic: the id it gives here is the one the edit below gives
    const id = addElement(doc.stack, selected.id, kind).id;
    update((d) => ({ ...d, stack: addElement(d.stack, selected.id, kind).stack }), `add:${id}`);
    select(id);
  };

  const onKey = (e: KeyboardEvent<HTMLUListElement>) => {
    if (e.key !== "ArrowDown" && e.key !== "ArrowUp") return;
    e.preventDefault();
    const k = rows.findIndex((r) => r.id === selectedId);
    const next = rows[Math.min(rows.length - 1, Math.max(0, k + (e.key === "ArrowDown" ? 1 : -1)))];
    if (next) {
      select(next.id);
      listRef.current?.querySelector<HTMLElement>(`[data-id="${CSS.escape(next.id)}"]`)?.focus();
    }
  };

  const targets = selected && selected.parent !== null ? moveTargets(doc.stack, selected.id) : [];

  return (
    <div className="flex min-h-0 flex-col">
      <ul ref={listRef} role="tree" aria-label="Elements" className="min-h-0 flex-1 overflow-y-auto py-1.5" onKeyDown={onKey}>
        {rows.map((r) => {
          const problems = issues.elements.get(r.index)?.length ?? 0;
          // geometry warnings never block saving: marked apart from problems, in the warning colour
          const slips = warnings.get(r.index) ?? [];
          const slipText = slips.map((w) => w.message).join("\n");
          const isSel = r.id === selectedId;
          return (
            <li
              key={`${r.index}:${r.id}`}
              role="treeitem"
              aria-level={r.depth + 1}
              aria-selected={isSel}
              aria-label={`${r.id}, ${KIND_SHORT[r.kind] ?? r.kind}${problems ? `, ${problems} problem${problems === 1 ? "" : "s"}` : ""}${
                slips.length ? `, ${slips.length} geometry warning${slips.length === 1 ? "" : "s"}` : ""
              }`}
              aria-description={slips.length ? slipText : undefined}
              data-geometry-warnings={slips.length || undefined}
              data-id={r.id}
              tabIndex={isSel || (!selectedId && r.depth === 0) ? 0 : -1}
              onClick={() => select(r.id)}
              onKeyDown={(e) => {
                if (e.key === "Enter" || e.key === " ") {
                  e.preventDefault();
                  select(r.id);
                }
              }}
              className={cn(
                "group relative mx-1.5 flex h-8 cursor-pointer items-center gap-2 rounded-md pr-2 text-[13px] outline-none select-none",
                isSel ? "bg-ink text-paper" : "text-ink hover:bg-ink/[0.05] focus-visible:ring-2 focus-visible:ring-gyro/40",
              )}
              style={{ paddingLeft: 8 + r.depth * 12 }}
            >
              {r.depth > 0 ? (
                <span
                  aria-hidden="true"
                  className={cn("absolute top-0 bottom-1/2 w-2 rounded-bl border-b border-l", isSel ? "border-paper/30" : "border-ink/20")}
                  style={{ left: 8 + (r.depth - 1) * 12 + 4 }}
                />
              ) : null}
              <span
                className="size-2.5 shrink-0 rounded-[2px] ring-1 ring-black/10"
                style={{ background: KIND_COLOR[r.kind] }}
                aria-hidden="true"
              />
              <span className="max-w-[70%] shrink-0 truncate font-semibold">{r.id || "(no id)"}</span>
              {/* deep in the tree, with a mark beside it, the kind may be cut: its title keeps it readable */}
              <span className={cn("min-w-0 truncate text-[11px]", isSel ? "text-paper/60" : "text-ink/45")} title={KIND_SHORT[r.kind]}>
                {KIND_SHORT[r.kind]}
              </span>
              {slips.length ? (
                <span
                  className={cn(
                    "ml-auto flex h-4 shrink-0 items-center gap-0.5 rounded-full px-0.5 text-[10px] font-bold",
                    isSel ? "bg-paper text-warn" : "bg-warn/15 text-warn",
                  )}
                  title={slipText}
                  aria-hidden="true"
                  data-testid={`geometry-mark-${r.id}`}
                >
                  <svg width="10" height="10" viewBox="0 0 16 16" fill="currentColor" aria-hidden="true">
                    <path d="M8 1.5 15 14.5H1Z" />
                  </svg>
                  {slips.length > 1 ? slips.length : null}
                </span>
              ) : null}
              {problems ? (
                <span
                  className={cn(
                    "flex h-4 min-w-4 items-center justify-center rounded-full px-1 text-[10px] font-bold",
                    slips.length ? "" : "ml-auto",
                    isSel ? "bg-paper text-fail" : "bg-fail text-white",
                  )}
                  title={`${problems} problem${problems === 1 ? "" : "s"}`}
                  aria-hidden="true"
                >
                  {problems}
                </span>
              ) : r.orphan ? (
                <span className={cn("text-[10px] font-bold text-fail", slips.length ? "" : "ml-auto")}>no parent</span>
              ) : null}
            </li>
          );
        })}
      </ul>
      {readOnly || !selected ? null : (
        <div className="border-t border-line p-2">
          <p className="mb-1.5 truncate text-[11px] font-semibold text-ink/50">
            Selected: <span className="font-mono font-bold text-ink/80">{selected.id}</span>
          </p>
          <div className="flex flex-wrap items-center gap-1">
            <div className="relative" ref={menuRef}>
              <Button
                size="sm"
                variant="primary"
                icon={<PlusIcon />}
                aria-haspopup="menu"
                aria-expanded={menu}
                onClick={() => setMenu((m) => !m)}
              >
                Add on {selected.id.length > 10 ? "it" : selected.id}
              </Button>
              {menu ? (
                <div
                  role="menu"
                  aria-label={`Add on ${selected.id}`}
                  className="absolute bottom-full left-0 z-20 mb-1 w-52 rounded-md border border-line bg-panel p-1 shadow-[0_12px_32px_-8px_rgba(23,33,43,0.35)]"
                >
                  {ADDABLE_KINDS.map((k) => (
                    <button
                      key={k}
                      role="menuitem"
                      type="button"
                      onClick={() => add(k)}
                      className="flex h-7.5 w-full items-center gap-2 rounded px-2 text-left text-xs font-semibold text-ink hover:bg-ink/[0.06]"
                    >
                      <span
                        className="size-2.5 rounded-[2px] ring-1 ring-black/10"
                        style={{ background: KIND_COLOR[k] }}
                        aria-hidden="true"
                      />
                      {KIND_NAME[k]}
                    </button>
                  ))}
                </div>
              ) : null}
            </div>
            {selected.parent !== null ? (
              <>
                <IconButton
                  label={`Move ${selected.id} up`}
                  disabled={selected.siblingIndex === 0}
                  onClick={() => update((d) => ({ ...d, stack: reorderElement(d.stack, selected.id, -1) }))}
                >
                  <ArrowIcon dir="up" />
                </IconButton>
                <IconButton
                  label={`Move ${selected.id} down`}
                  disabled={selected.siblingIndex >= selected.siblingCount - 1}
                  onClick={() => update((d) => ({ ...d, stack: reorderElement(d.stack, selected.id, 1) }))}
                >
                  <ArrowIcon dir="down" />
                </IconButton>
                <IconButton
                  label={`Remove ${selected.id}`}
                  variant="danger-ghost"
                  onClick={() => {
                    const parent = selected.parent;
                    update((d) => ({ ...d, stack: removeElement(d.stack, selected.id).stack }));
                    select(parent);
                  }}
                >
                  <TrashIcon />
                </IconButton>
              </>
            ) : null}
          </div>
          {rows.length === 1 ? (
            <p className="mt-2 text-[11px] leading-4 text-ink/55">
              Start with the package: <span className="font-semibold text-ink/75">Add on board → Substrate</span>, then put the ASIC and the
              sensor dies on it.
            </p>
          ) : null}
          {selected.parent !== null ? (
            <label className="mt-1.5 flex items-center gap-1.5 text-[11px] font-semibold text-ink/60">
              <span className="shrink-0">Sits on</span>
              <SelectInput
                aria-label={`Move ${selected.id} onto`}
                value={selected.parent}
                onChange={(e) => update((d) => ({ ...d, stack: moveElement(d.stack, selected.id, e.target.value) }))}
              >
                <option value={selected.parent}>{selected.parent}</option>
                {targets.map((t) => (
                  <option key={t.id} value={t.id}>
                    {t.id} ({KIND_SHORT[t.kind]})
                  </option>
                ))}
              </SelectInput>
            </label>
          ) : null}
        </div>
      )}
    </div>
  );
}
