import { useEffect, useMemo } from "react";
import { zodResolver } from "@hookform/resolvers/zod";
import { useForm } from "react-hook-form";
import { Link } from "react-router";
import * as z from "zod";
import { DEFAULT_CPK } from "@shared/reports/capability";
import { CreateReportSchema, type Report } from "@shared/schemas/reports";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { Dialog } from "@frontend/components/ui/dialog";
import { Field, Input, Select, Textarea } from "@frontend/components/ui/field";
import { Spinner } from "@frontend/components/ui/spinner";
import { cn } from "@frontend/lib/cn";
import { formatDate } from "@frontend/lib/format";
import { formatFraction } from "@shared/format";
import { setServerErrors } from "@frontend/lib/form";
import { useCreateReport } from "../api/create-report";
import { useReportOptions } from "../api/get-report-options";
import { readPng } from "../lib/files";

type Props = {
  projectId: string;
  open: boolean;
  onClose: () => void;
  onBuilt: (report: Report) => void;
  studyId?: string;
  supplierId?: string;
  cpk?: number;
};

/** The dialog as typed: Cpk is text until it is sent, the picture keeps its file name; the study goes in the address. */
const BuildFormSchema = z
  .object({
    studyId: z.string(),
    supplierId: z.string(),
    cpk: z.string(),
    note: z.string(),
    snapshotPng: z.object({ name: z.string(), url: z.string() }).nullable(),
  })
  .transform((v): z.input<typeof CreateReportSchema> => ({
    supplierId: v.supplierId,
    cpk: Number(v.cpk),
    note: v.note,
    ...(v.snapshotPng ? { snapshotPng: v.snapshotPng.url } : {}),
  }))
  .pipe(CreateReportSchema);
type BuildForm = z.input<typeof BuildFormSchema>;

/**
 * Builds a supplier's report: a finished study on an approved revision, one of the companies
 * that own tolerances in it, the capability asked, and optionally the 3D view's PNG.
 */
export function BuildReportDialog({
  projectId,
  open,
  onClose,
  onBuilt,
  studyId: initialStudy,
  supplierId: initialSupplier,
  cpk: initialCpk,
}: Props) {
  const options = useReportOptions(projectId, open);
  const create = useCreateReport();
  const studies = useMemo(() => options.data?.studies ?? [], [options.data]);
  const eligible = studies.filter((s) => s.blockedBy === null);
  const defaultValues: BuildForm = {
    studyId: initialStudy ?? "",
    supplierId: initialSupplier ?? "",
    cpk: String(initialCpk ?? DEFAULT_CPK),
    note: "",
    snapshotPng: null,
  };
  const form = useForm({ resolver: zodResolver(BuildFormSchema), defaultValues });
  const { errors } = form.formState;
  const { setValue } = form;
  const studyId = form.watch("studyId");
  const supplierId = form.watch("supplierId");
  const snapshot = form.watch("snapshotPng");

  useEffect(() => {
    if (!studyId && eligible[0]) setValue("studyId", eligible[0].id);
  }, [studyId, eligible, setValue]);
  const study = studies.find((s) => s.id === studyId);
  const suppliers = useMemo(() => study?.suppliers ?? [], [study]);
  useEffect(() => {
    if (!study) return;
    if (!suppliers.some((s) => s.supplierId === supplierId)) {
      // the company holding the most tolerances is the likeliest one to report to
      const free =
        [...suppliers].sort((a, b) => b.sources.length - a.sources.length).find((s) => s.latest?.status !== "draft") ?? suppliers[0];
      setValue("supplierId", free?.supplierId ?? "");
    }
  }, [study, suppliers, supplierId, setValue]);
  const chosen = suppliers.find((s) => s.supplierId === supplierId);
  const draftInTheWay = chosen?.latest?.status === "draft" ? chosen.latest : null;

  function close() {
    create.reset();
    form.clearErrors();
    onClose();
  }

  async function pick(file: File | undefined) {
    form.clearErrors("snapshotPng");
    if (!file) return setValue("snapshotPng", null);
    try {
      setValue("snapshotPng", { name: file.name, url: await readPng(file) });
    } catch (e) {
      setValue("snapshotPng", null);
      form.setError("snapshotPng", { type: "file", message: e instanceof Error ? e.message : "The image could not be read." });
    }
  }

  const submit = form.handleSubmit((body) =>
    create.mutate({ studyId: form.getValues("studyId"), body }, { onSuccess: onBuilt, onError: (e) => setServerErrors(form, e) }),
  );

  const blocked = !study || study.blockedBy !== null || !chosen || draftInTheWay !== null;

  return (
    <Dialog
      open={open}
      onClose={close}
      title="Build a supplier report"
      description="The supplier's tolerances, the capability asked and the requirements they feed, from a finished study on an approved revision. It stays a draft until a reviewer releases it."
      busy={create.isPending}
      onSubmit={submit}
      formLabel="Build a supplier report"
      footer={
        <>
          <Button variant="secondary" onClick={close} disabled={create.isPending}>
            Cancel
          </Button>
          <Button type="submit" variant="primary" pending={create.isPending} disabled={blocked}>
            Build draft
          </Button>
        </>
      }
    >
      {options.isPending ? (
        <p className="flex items-center gap-2 py-6 text-[13px] text-ink/55">
          <Spinner /> Looking for finished studies…
        </p>
      ) : options.isError ? (
        <Alert>{options.error.message}</Alert>
      ) : eligible.length === 0 ? (
        <Alert tone="info" title="No study to build from yet">
          A report needs a finished study that ran on an approved stack revision.
          {studies[0]?.blockedBy ? (
            <span className="mt-1 block">
              Study {studies[0].number}: {studies[0].blockedBy}
            </span>
          ) : null}
        </Alert>
      ) : (
        <div className="space-y-4">
          <Field label="Study" error={errors.studyId?.message}>
            {({ id, describedBy, invalid }) => (
              <Select id={id} aria-describedby={describedBy} invalid={invalid} {...form.register("studyId")}>
                {studies.map((s) => (
                  <option key={s.id} value={s.id} disabled={s.blockedBy !== null}>
                    Study {s.number}
                    {s.label ? `: ${s.label}` : ""} (stack revision {s.revisionNumber}
                    {s.blockedBy
                      ? `, ${s.status === "finished" ? `revision ${s.revisionStatus.replace("_", " ")}` : s.status}`
                      : s.finishedAt
                        ? `, finished ${formatDate(s.finishedAt)}`
                        : ""}
                    )
                  </option>
                ))}
              </Select>
            )}
          </Field>

          {study && study.missed.length ? (
            <Alert title={`Study ${study.number} misses ${study.missed.length === 1 ? "a target" : `${study.missed.length} targets`}`}>
              <ul className="mt-1 list-disc pl-4">
                {study.missed.map((m) => (
                  <li key={m.metric}>
                    {m.label}: {formatFraction(m.predictedYield)} predicted against {formatFraction(m.yield)}
                  </li>
                ))}
              </ul>
              <span className="mt-1 block">The report can still be built; its cover says so to the supplier.</span>
            </Alert>
          ) : null}

          <fieldset className="min-w-0">
            <legend className="mb-1 text-xs font-semibold text-ink/80">Supplier</legend>
            {suppliers.length === 0 ? (
              <p className="rounded-md border border-dashed border-line px-3 py-3 text-[13px] text-ink/60">
                No tolerance of this study's stack names a supplier company as its owner. Set the owners in the stack editor's tolerance
                table.
              </p>
            ) : (
              <div className="divide-y divide-line overflow-hidden rounded-md border border-line" role="radiogroup" aria-label="Supplier">
                {suppliers.map((s) => (
                  <label
                    key={s.supplierId}
                    className={cn(
                      "flex cursor-pointer items-start gap-2.5 px-3 py-2 text-[13px] hover:bg-paper/60",
                      s.supplierId === supplierId && "bg-mag/[0.05]",
                    )}
                  >
                    <input
                      type="radio"
                      name="supplier"
                      value={s.supplierId}
                      checked={s.supplierId === supplierId}
                      onChange={() => setValue("supplierId", s.supplierId)}
                      className="mt-1 accent-[var(--color-mag)]"
                    />
                    <span className="min-w-0 flex-1">
                      <span className="font-bold text-ink">{s.name}</span>
                      <span className="ml-2 text-xs text-ink/55">
                        {s.sources.length} tolerance{s.sources.length === 1 ? "" : "s"} · {s.contacts} contact{s.contacts === 1 ? "" : "s"}
                      </span>
                      <span className="mt-0.5 block truncate text-xs text-ink/50" title={s.sources.join(", ")}>
                        {s.sources.join(", ")}
                      </span>
                    </span>
                    {s.latest ? (
                      <span className="shrink-0 text-xs text-ink/55">
                        {s.latest.status === "draft" ? "draft" : "last"} {s.latest.code} r{s.latest.revision}
                      </span>
                    ) : null}
                  </label>
                ))}
              </div>
            )}
            {errors.supplierId ? <p className="mt-1 text-xs font-medium text-fail">{errors.supplierId.message}</p> : null}
            {draftInTheWay ? (
              <p className="mt-1.5 text-xs text-ink/65">
                {draftInTheWay.code} revision {draftInTheWay.revision} for {chosen?.name} is still a draft.{" "}
                <Link
                  to={`/reports/${draftInTheWay.id}`}
                  className="font-semibold text-gyro underline-offset-2 hover:underline"
                  onClick={close}
                >
                  Open the draft
                </Link>
              </p>
            ) : null}
            {study && study.unmatchedOwners.length ? (
              <p className="mt-1.5 text-xs text-ink/50">
                Owners that name no company: {study.unmatchedOwners.map((u) => `“${u.owner}” (${u.sources.length})`).join(", ")}. They are
                not in any supplier's report.
              </p>
            ) : null}
          </fieldset>

          <div className="grid grid-cols-[140px_minmax(0,1fr)] gap-3">
            <Field label="Capability asked" aside="Cpk ≥" error={errors.cpk?.message}>
              {({ id, describedBy, invalid }) => (
                <Input
                  id={id}
                  aria-describedby={describedBy}
                  invalid={invalid}
                  inputMode="decimal"
                  className="num"
                  {...form.register("cpk")}
                />
              )}
            </Field>
            <p className="self-end pb-1.5 text-xs leading-4 text-ink/55">
              For a tolerance ±T, a process centred on the target meets it with σ ≤ T / (3·Cpk). Where the study assumed a tighter process,
              the report asks for that.
            </p>
          </div>

          <Field label="Note to the supplier" aside="optional" error={errors.note?.message}>
            {({ id, describedBy, invalid }) => (
              <Textarea
                id={id}
                aria-describedby={describedBy}
                invalid={invalid}
                rows={2}
                placeholder="Printed under the assumptions, e.g. which line or lot this covers."
                {...form.register("note")}
              />
            )}
          </Field>

          <Field
            label="3D snapshot"
            aside="optional, PNG"
            error={errors.snapshotPng?.message}
            hint={
              snapshot
                ? `${snapshot.name} will be printed on the cover.`
                : "Attach the PNG saved from the 3D view; without one the report draws a schematic side view."
            }
          >
            {({ id, describedBy, invalid }) => (
              <input
                id={id}
                type="file"
                accept="image/png"
                aria-describedby={describedBy}
                aria-invalid={invalid || undefined}
                onChange={(e) => void pick(e.target.files?.[0])}
                className="block w-full text-xs text-ink/70 file:mr-3 file:h-7.5 file:rounded-md file:border file:border-line file:bg-panel file:px-3 file:text-xs file:font-semibold file:text-ink hover:file:border-ink/30"
              />
            )}
          </Field>

          {errors.root?.server ? <Alert>{errors.root.server.message}</Alert> : null}
        </div>
      )}
    </Dialog>
  );
}
