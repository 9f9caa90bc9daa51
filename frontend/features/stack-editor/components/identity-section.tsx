/** The element's identity in its form: id (renamed everywhere when complete), kind, stage and name. */
import { useEffect, useState } from "react";
import { ELEMENT_KINDS, isSensorKind, type ElementKind, type StackElement } from "@shared/schemas/stack-file";
import { fieldError, type LocalIssue } from "../lib/issues";
import { KIND_NAME, STAGE_LABEL } from "../lib/kinds";
import { renameElement } from "../lib/stack-ops";
import { useEditor } from "./editor-context";
import { FieldShell, SelectInput, TextInput } from "./fields";
import { Section } from "./form-section";

export function IdentitySection({ index, el, list }: { index: number; el: StackElement; list: LocalIssue[] | undefined }) {
  const { update, setAt, readOnly, select, doc } = useEditor();
  const isBoard = el.parent === null;
  // The id is a key of the tree and of metric names: it is applied when it is complete.
  const [idText, setIdText] = useState(el.id);
  useEffect(() => setIdText(el.id), [el.id]);
  const taken = doc.stack.elements.some((e, i) => i !== index && e.id === idText);
  const idLocal =
    idText === ""
      ? "the id cannot be empty"
      : taken
        ? `another element already has the id "${idText}"`
        : !/^[A-Za-z0-9_-]+$/.test(idText)
          ? "an id may hold letters, digits, - and _ only"
          : null;
  const applyId = () => {
    if (idLocal || idText === el.id) return;
    const from = el.id;
    update((d) => renameElement(d, from, idText), `rename:${index}`);
    select(idText);
  };
  return (
    <Section title="Element">
      <div className="grid grid-cols-2 gap-2">
        <FieldShell label="Id" error={idLocal ?? fieldError(list, "id")} hint="names metrics, e.g. mag.tiltDeg">
          {({ id, describedBy, invalid }) => (
            <TextInput
              id={id}
              aria-describedby={describedBy}
              invalid={invalid}
              value={idText}
              disabled={readOnly}
              maxLength={64}
              className="font-mono"
              onChange={(e) => setIdText(e.target.value)}
              onBlur={applyId}
              onKeyDown={(e) => {
                if (e.key === "Enter") applyId();
                if (e.key === "Escape") setIdText(el.id);
              }}
            />
          )}
        </FieldShell>
        <FieldShell label="Kind" error={fieldError(list, "kind")}>
          {({ id, invalid }) => (
            <SelectInput
              id={id}
              invalid={invalid}
              value={el.kind}
              disabled={readOnly || isBoard}
              onChange={(e) => {
                const kind = e.target.value as ElementKind;
                update((d) => {
                  const elements = [...d.stack.elements];
                  const next: StackElement = { ...elements[index], kind };
                  // sensing-axis alignment belongs to sensor dies only
                  if (!isSensorKind(kind)) delete next.axisTol;
                  elements[index] = next;
                  return { ...d, stack: { ...d.stack, elements } };
                });
              }}
            >
              {ELEMENT_KINDS.filter((k) => (isBoard ? k === "board" : k !== "board")).map((k) => (
                <option key={k} value={k}>
                  {KIND_NAME[k]}
                </option>
              ))}
            </SelectInput>
          )}
        </FieldShell>
      </div>
      <div className="mt-2 grid grid-cols-[1fr_1.6fr] gap-2">
        <FieldShell label="Stage" error={fieldError(list, "stage")}>
          {({ id, describedBy, invalid }) => (
            <SelectInput
              id={id}
              aria-describedby={describedBy}
              invalid={invalid}
              value={el.stage ?? ""}
              disabled={readOnly}
              onChange={(e) => setAt(["stack", "elements", index, "stage"], e.target.value || undefined)}
            >
              <option value="">{isBoard ? "Board" : "Package"} (default)</option>
              {(["package", "board", "product"] as const).map((s) => (
                <option key={s} value={s}>
                  {STAGE_LABEL[s]}
                </option>
              ))}
            </SelectInput>
          )}
        </FieldShell>
        <FieldShell label="Name" error={fieldError(list, "name")}>
          {({ id, invalid }) => (
            <TextInput
              id={id}
              invalid={invalid}
              value={el.name ?? ""}
              placeholder={isBoard ? "e.g. Main board, 8-layer FR-4" : "e.g. 3-axis magnetometer die, rev B"}
              disabled={readOnly}
              maxLength={200}
              onChange={(e) =>
                setAt(["stack", "elements", index, "name"], e.target.value === "" ? undefined : e.target.value, `name:${index}`)
              }
            />
          )}
        </FieldShell>
      </div>
    </Section>
  );
}
