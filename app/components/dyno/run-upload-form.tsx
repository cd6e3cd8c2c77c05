// The run upload form: the file, its units, the run's weather and details; sent with a
// progress bar, and the server's verdict (stored, or why not, with the first bad rows).
import { useState } from "react";
import { getFormProps, getInputProps, getSelectProps, useForm } from "@conform-to/react";
import type { SubmissionResult } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { useRevalidator } from "react-router";
import { RunFormSchema } from "~/lib/dyno/run-form";
import type { RunUploadAnswer } from "~/lib/dyno/upload.server";
import { Field, controlClass } from "~/components/ui/field";
import { buttonClass } from "~/components/ui/button";
import { UploadProgress, uploadWithProgress } from "./xhr-upload";

export function RunUploadForm({
  packageId,
  units,
}: {
  packageId: number;
  units: "inch" | "metric";
}) {
  const revalidator = useRevalidator();
  const [lastResult, setLastResult] = useState<SubmissionResult<string[]> | undefined>();
  const [progress, setProgress] = useState<number | null>(null);
  const [verdict, setVerdict] = useState<RunUploadAnswer | null>(null);
  const [form, fields] = useForm({
    id: "run-upload",
    lastResult,
    // Conform restores these when the form is reset after an upload
    defaultValue: {
      torqueUnit: units === "metric" ? "nm" : "lbft",
      powerUnit: units === "metric" ? "kw" : "hp",
      tempUnit: units === "metric" ? "C" : "F",
      baroUnit: units === "metric" ? "kpa" : "inhg",
    },
    shouldValidate: "onSubmit",
    shouldRevalidate: "onBlur",
    onValidate: ({ formData }) => parseWithZod(formData, { schema: RunFormSchema }),
    async onSubmit(event, { formData }) {
      event.preventDefault();
      setVerdict(null);
      setProgress(0);
      try {
        const { status, json } = await uploadWithProgress<RunUploadAnswer>(
          `/packages/${packageId}/dyno/upload`,
          formData,
          setProgress,
        );
        const answer: RunUploadAnswer = json ?? {
          ok: false,
          message: `The server answered ${status}; nothing was stored.`,
        };
        setVerdict(answer);
        if (!answer.ok && answer.result) setLastResult(answer.result);
        if (answer.ok) {
          (event.target as HTMLFormElement).reset();
          await revalidator.revalidate();
        }
      } catch (e) {
        setVerdict({ ok: false, message: (e as Error).message });
      } finally {
        setProgress(null);
      }
    },
  });
  const f = fields;
  const input = (name: keyof typeof f, type: "text" | "number" | "date" = "text") =>
    getInputProps(f[name] as never, { type: type as never });
  return (
    <form {...getFormProps(form)} encType="multipart/form-data" className="space-y-3" noValidate>
      <div className="grid gap-3 sm:grid-cols-2">
        <Field id={f.label.id} label="Run name" errorId={f.label.errorId} errors={f.label.errors}>
          <input
            {...input("label")}
            placeholder="e.g. after cam"
            className={controlClass(f.label.errors)}
          />
        </Field>
        <Field
          id={f.runDate.id}
          label="Run date"
          errorId={f.runDate.errorId}
          errors={f.runDate.errors}
        >
          <input {...input("runDate", "date")} className={controlClass(f.runDate.errors)} />
        </Field>
        <Field
          id={f.torqueUnit.id}
          label="Torque in the file"
          errorId={f.torqueUnit.errorId}
          errors={f.torqueUnit.errors}
        >
          <select {...getSelectProps(f.torqueUnit)} className={controlClass(f.torqueUnit.errors)}>
            <option value="lbft">lb·ft</option>
            <option value="nm">N·m</option>
          </select>
        </Field>
        <Field
          id={f.powerUnit.id}
          label="Power in the file"
          errorId={f.powerUnit.errorId}
          errors={f.powerUnit.errors}
        >
          <select {...getSelectProps(f.powerUnit)} className={controlClass(f.powerUnit.errors)}>
            <option value="hp">hp</option>
            <option value="kw">kW</option>
          </select>
        </Field>
      </div>
      <fieldset className="rounded border border-steel-200 p-3">
        <legend className="px-1 text-sm font-semibold text-graphite">
          Weather at the run (for the correction)
        </legend>
        <div className="grid gap-3 sm:grid-cols-3">
          <div className="flex gap-2">
            <div className="flex-1">
              <Field
                id={f.airTemp.id}
                label="Air temperature"
                errorId={f.airTemp.errorId}
                errors={f.airTemp.errors}
              >
                <input
                  {...input("airTemp")}
                  inputMode="decimal"
                  className={controlClass(f.airTemp.errors)}
                />
              </Field>
            </div>
            <div className="w-20">
              <Field id={f.tempUnit.id} label="Unit" errorId={f.tempUnit.errorId}>
                <select {...getSelectProps(f.tempUnit)} className={controlClass(null)}>
                  <option value="F">°F</option>
                  <option value="C">°C</option>
                </select>
              </Field>
            </div>
          </div>
          <div className="flex gap-2">
            <div className="flex-1">
              <Field
                id={f.baro.id}
                label="Barometric pressure"
                errorId={f.baro.errorId}
                errors={f.baro.errors}
              >
                <input
                  {...input("baro")}
                  inputMode="decimal"
                  className={controlClass(f.baro.errors)}
                />
              </Field>
            </div>
            <div className="w-24">
              <Field id={f.baroUnit.id} label="Unit" errorId={f.baroUnit.errorId}>
                <select {...getSelectProps(f.baroUnit)} className={controlClass(null)}>
                  <option value="inhg">inHg</option>
                  <option value="kpa">kPa</option>
                </select>
              </Field>
            </div>
          </div>
          <Field
            id={f.humidity.id}
            label="Relative humidity (%)"
            errorId={f.humidity.errorId}
            errors={f.humidity.errors}
          >
            <input
              {...input("humidity")}
              inputMode="decimal"
              className={controlClass(f.humidity.errors)}
            />
          </Field>
        </div>
        <p className="mt-2 text-sm text-steel-700">
          Leave the weather empty if it was not logged: the run is then shown uncorrected and cannot
          count.
        </p>
      </fieldset>
      <div className="grid gap-3 sm:grid-cols-2">
        <Field id={f.gear.id} label="Gear" errorId={f.gear.errorId} errors={f.gear.errors}>
          <input {...input("gear")} className={controlClass(f.gear.errors)} />
        </Field>
        <Field id={f.notes.id} label="Notes" errorId={f.notes.errorId} errors={f.notes.errors}>
          <input {...input("notes")} className={controlClass(f.notes.errors)} />
        </Field>
      </div>
      <Field
        id={f.file.id}
        label="Run file (CSV, up to 10 MB)"
        hint="First row: column names — rpm, and torque and/or power; one row per logged point."
        errorId={f.file.errorId}
        errors={f.file.errors}
      >
        <input
          id={f.file.id}
          name={f.file.name}
          type="file"
          accept=".csv,text/csv"
          aria-invalid={f.file.errors ? true : undefined}
          aria-describedby={`${f.file.id}-hint ${f.file.errorId}`}
          className="mt-1 block w-full text-sm"
        />
      </Field>
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" name="dropBad" />
        Drop the bad rows and keep the rest
      </label>
      <button type="submit" className={buttonClass("primary")} disabled={progress !== null}>
        Upload the run
      </button>
      {progress !== null ? <UploadProgress fraction={progress} label="Uploading the run" /> : null}
      {verdict ? <Verdict answer={verdict} /> : null}
    </form>
  );
}

function Verdict({ answer }: { answer: RunUploadAnswer }) {
  if (answer.ok)
    return (
      <p role="status" className="rounded border border-green bg-white p-2 text-sm">
        Stored: {answer.points} points{answer.dropped ? `, ${answer.dropped} bad rows dropped` : ""}
        .
      </p>
    );
  return (
    <div role="alert" className="rounded border border-red bg-white p-2 text-sm">
      <p className="font-semibold text-red-text">{answer.message}</p>
      {answer.badRows && answer.badRows.length > 0 ? (
        <ul className="mt-1 list-disc pl-5">
          {answer.badRows.map((r) => (
            <li key={r.line}>
              Line {r.line}: {r.message}
            </li>
          ))}
          {answer.badCount && answer.badCount > answer.badRows.length ? (
            <li>…and {answer.badCount - answer.badRows.length} more.</li>
          ) : null}
        </ul>
      ) : null}
    </div>
  );
}
