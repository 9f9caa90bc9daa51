import type { Dataset } from "@shared/schemas/datasets";
import { formatCount, unitText } from "@shared/format";

/** The first rows as they are in the file, with the file's own row numbers. */
export function DatasetPreview({ dataset }: { dataset: Dataset }) {
  const { preview, columns } = dataset;
  return (
    <div className="max-h-[360px] overflow-auto">
      <table className="w-full border-collapse text-[12.5px]" aria-label="Preview of the first rows">
        <thead className="sticky top-0 z-10 border-b border-line bg-paper">
          <tr>
            <th scope="col" className="h-8 w-12 px-2 text-right text-2xs font-bold text-ink/45" title="Row in the file">
              Row
            </th>
            {columns.map((c) => (
              <th
                key={c.key}
                scope="col"
                className={`h-8 px-3 text-2xs font-bold whitespace-nowrap text-ink/65 ${c.kind === "number" ? "text-right" : "text-left"}`}
              >
                <span className="mr-1 font-mono text-ink/35">{c.letter}</span>
                {c.name}
                {c.unit ? <span className="ml-1 font-semibold text-ink/45">[{unitText(c.unit)}]</span> : null}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {preview.cells.map((row, i) => (
            <tr key={preview.rowNumbers[i]} className="border-b border-line/60 last:border-b-0">
              <td className="num h-7 px-2 text-2xs text-ink/40">{preview.rowNumbers[i]}</td>
              {row.map((cell, k) => (
                <td key={columns[k].key} className={`h-7 px-3 whitespace-nowrap ${columns[k].kind === "number" ? "num" : "text-ink/75"}`}>
                  {cell}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
      {dataset.rows > preview.cells.length ? (
        <p className="border-t border-line px-3 py-2 text-xs text-ink/55">
          The first {preview.cells.length} of {formatCount(dataset.rows)} rows.
        </p>
      ) : null}
    </div>
  );
}
