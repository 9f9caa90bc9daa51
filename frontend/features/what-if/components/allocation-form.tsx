import { useMemo } from "react";
import { zodResolver } from "@hookform/resolvers/zod";
import { useForm } from "react-hook-form";
import * as z from "zod";
import { stackSources } from "@shared/datasets/sources";
import type { CreateAllocation } from "@shared/schemas/what-if";
import type { StackFile } from "@shared/schemas/stack-file";
import { DEFAULT_BOUND_FACTORS } from "@shared/whatif/allocation";
import { DEFAULT_COSTS, defaultCost, sourceKind } from "@shared/whatif/cost";
import { unitText } from "@shared/format";
import { Button } from "@frontend/components/ui/button";
import { Field, Input } from "@frontend/components/ui/field";
import { Table, TableFrame, Td, Th, THead, Tr } from "@frontend/components/ui/table";
import { firstErrorMessage } from "@frontend/lib/form";
import { TrialsTextSchema } from "../lib/values";

const RowSchema = z.object({
  id: z.string(),
  unit: z.enum(["um", "deg"]),
  current: z.number(),
  free: z.boolean(),
  a: z.string(),
  b: z.string(),
  k: z.string(),
  min: z.string(),
  max: z.string(),
});
type Row = z.infer<typeof RowSchema>;

const num = (s: string) => (s.trim() === "" ? NaN : Number(s));
const short = (v: number) => String(Number(v.toPrecision(3)));

/** The table as typed, turned into what an allocation asks for: the free sources with their cost curves and bounds. */
const RowsSchema = z.array(RowSchema).transform((rows, ctx): Omit<CreateAllocation, "study"> => {
  const free = rows.filter((r) => r.free);
  const bad = free.find((r) => !(num(r.b) > 0 && num(r.k) > 0 && num(r.a) >= 0 && num(r.min) > 0 && num(r.max) > num(r.min)));
  const message = !free.length ? "free at least one source" : bad ? `${bad.id}: a ≥ 0, b > 0, k > 0 and 0 < min < max` : null;
  if (message) {
    ctx.addIssue({ code: "custom", message });
    return z.NEVER;
  }
  return {
    free: free.map((r) => r.id),
    costs: Object.fromEntries(free.map((r) => [r.id, { a: num(r.a), b: num(r.b), k: num(r.k) }])),
    bounds: Object.fromEntries(free.map((r) => [r.id, { min: num(r.min), max: num(r.max) }])),
  };
});
const AllocationFormSchema = z.object({ trials: TrialsTextSchema, rows: RowsSchema });

/**
 * The allocation's settings: the trials of each verifying run, which sources may change, their cost curves a + b/T^k
 * and bounds (defaults per kind of source).
 */
export function AllocationForm({
  stack,
  defaultTrials,
  pending,
  onSubmit,
}: {
  stack: StackFile;
  defaultTrials: string;
  pending: boolean;
  onSubmit: (body: Omit<CreateAllocation, "study">, trials: number) => void;
}) {
  const initial = useMemo<Row[]>(
    () =>
      stackSources(stack)
        .filter((s) => s.tolerance.dist !== "data" && (s.tolerance.tol ?? 0) > 0)
        .map((s) => {
          const T = s.tolerance.tol!;
          const c = defaultCost(s.id);
          return {
            id: s.id,
            unit: s.unit,
            current: T,
            free: true,
            a: String(c.a),
            b: String(c.b),
            k: String(c.k),
            min: short(T * DEFAULT_BOUND_FACTORS.min),
            max: short(T * DEFAULT_BOUND_FACTORS.max),
          };
        }),
    [stack],
  );
  const form = useForm({ resolver: zodResolver(AllocationFormSchema), defaultValues: { trials: defaultTrials, rows: initial } });
  const rows = form.watch("rows");
  const error = firstErrorMessage(form.formState.errors.rows);

  const cell = (i: number, key: "a" | "b" | "k" | "min" | "max", label: string) => (
    <Input
      compact
      aria-label={`${rows[i].id} ${label}`}
      className="w-20 text-right"
      disabled={!rows[i].free}
      {...form.register(`rows.${i}.${key}`)}
    />
  );

  return (
    <form onSubmit={form.handleSubmit(({ rows, trials }) => onSubmit(rows, trials))} className="flex flex-col gap-3">
      <Field label="Trials per verifying run" className="max-w-48" error={form.formState.errors.trials?.message}>
        {({ id, describedBy, invalid }) => (
          <Input id={id} inputMode="numeric" invalid={invalid} aria-describedby={describedBy} {...form.register("trials")} />
        )}
      </Field>
      <p className="text-[13px] text-ink/70">
        Cost of holding a tolerance T: a + b / T<sup>k</sup>, in relative units. The starting values per kind of source (
        {Object.values(DEFAULT_COSTS)
          .map((c) => c.what)
          .filter((w, i, all) => all.indexOf(w) === i)
          .join(", ")}
        ) are placeholders: put in what your suppliers charge.
      </p>
      <TableFrame>
        <Table>
          <THead>
            <tr>
              <Th>Free</Th>
              <Th>Source</Th>
              <Th align="right">Today ±T</Th>
              <Th align="right">a</Th>
              <Th align="right">b</Th>
              <Th align="right">k</Th>
              <Th align="right">Lowest T</Th>
              <Th align="right">Highest T</Th>
            </tr>
          </THead>
          <tbody>
            {rows.map((r, i) => (
              <Tr key={r.id}>
                <Td>
                  <input type="checkbox" aria-label={`${r.id} free`} {...form.register(`rows.${i}.free`)} />
                </Td>
                <Td>
                  <span className="font-semibold">{r.id}</span> <span className="text-ink/50">{sourceKind(r.id)}</span>
                </Td>
                <Td numeric>
                  {r.current} {unitText(r.unit)}
                </Td>
                <Td numeric>{cell(i, "a", "a")}</Td>
                <Td numeric>{cell(i, "b", "b")}</Td>
                <Td numeric>{cell(i, "k", "k")}</Td>
                <Td numeric>{cell(i, "min", "lowest")}</Td>
                <Td numeric>{cell(i, "max", "highest")}</Td>
              </Tr>
            ))}
          </tbody>
        </Table>
      </TableFrame>
      {error ? <p className="text-[13px] font-semibold text-fail">{error}</p> : null}
      <div>
        <Button type="submit" variant="primary" pending={pending}>
          Find the least-cost tolerances
        </Button>
      </div>
    </form>
  );
}
