import { useState, type FormEvent } from "react";
import { Button } from "@frontend/components/ui/button";
import { formatCount } from "@shared/format";
import { isApiError } from "@frontend/lib/api-client";
import type { StudyBudget } from "@shared/schemas/studies";
import { useSetStudyBudget } from "../api/study-budget";

/**
 * An admin's control over the workspace's work budget of one study, beside the study that
 * would need more. Its own small form (the settings form around it starts studies).
 */
export function SettingsBudgetEditor({ budget, needed }: { budget: StudyBudget; needed: number | null }) {
  const [value, setValue] = useState(String(needed && needed > budget.budget ? Math.min(needed, budget.maxBudget) : budget.budget));
  const save = useSetStudyBudget();
  const error = save.error ? (isApiError(save.error) && save.error.fields[0]?.message) || save.error.message : null;
  return (
    <div className="mt-2 flex flex-col gap-1 rounded-md border border-line bg-paper px-2.5 py-2 text-2xs">
      <label htmlFor="study-work-budget" className="font-semibold text-ink/70">
        Work budget of one study (admin)
      </label>
      <div className="flex gap-2">
        <input
          id="study-work-budget"
          inputMode="numeric"
          className="num w-full rounded-md border border-line bg-white px-2 py-1 text-xs"
          value={value}
          onChange={(e) => setValue(e.target.value)}
          onKeyDown={(e) => {
            // Enter sets the budget; it must not submit the study form around it
            if (e.key === "Enter") {
              e.preventDefault();
              save.mutate(Number(value.replace(/[\s,_]/g, "")));
            }
          }}
        />
        <Button
          type="button"
          size="sm"
          pending={save.isPending}
          onClick={(e: FormEvent) => {
            e.preventDefault();
            save.mutate(Number(value.replace(/[\s,_]/g, "")));
          }}
        >
          Set
        </Button>
      </div>
      <span className="text-ink/50">
        Default {formatCount(budget.defaultBudget)}, at most {formatCount(budget.maxBudget)} trial-attitudes. A larger budget lets one study
        hold the engine longer while others wait.
      </span>
      {error ? (
        <span role="alert" className="text-fail">
          {error}
        </span>
      ) : null}
    </div>
  );
}
