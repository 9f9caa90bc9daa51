import { Select } from "@frontend/components/ui/field";
import { groupMetrics, metricLabel } from "@shared/metrics";

/** A metric picker grouped by sensor: heading first, then each die, relative rotations, tilts. */
export function MetricSelect({
  ids,
  value,
  onChange,
  label,
  elementOrder,
  required = [],
  className,
}: {
  ids: string[];
  value: string;
  onChange: (id: string) => void;
  label: string;
  elementOrder?: string[];
  /** metrics that carry a requirement, marked in the list */
  required?: string[];
  className?: string;
}) {
  return (
    <div className={className ?? "w-96 max-w-full"}>
      <Select compact aria-label={label} value={value} onChange={(e) => onChange(e.target.value)}>
        {groupMetrics(ids, elementOrder).map((g) => (
          <optgroup key={g.label} label={g.label}>
            {g.ids.map((id) => (
              <option key={id} value={id}>
                {required.includes(id) ? "● " : ""}
                {metricLabel(id)} ({id})
              </option>
            ))}
          </optgroup>
        ))}
      </Select>
    </div>
  );
}
