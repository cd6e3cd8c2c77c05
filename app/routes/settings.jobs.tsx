import { readForm } from "~/lib/http/body";
import { zId } from "~/lib/http/ids";
import { getFormProps, getInputProps, useForm, type SubmissionResult } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { sql } from "kysely";
import { data, Form, useActionData, useNavigation } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/settings.jobs";
import { FieldErrors } from "~/components/ui/field";
import { FormAlert, formErrorsOf } from "~/components/ui/alert";
import { SubmitButton } from "~/components/ui/button";
import { TextField } from "~/components/ui/field";
import { PageHeader } from "~/components/ui/page-header";
import { requirePermission } from "~/lib/auth/auth.server";
import { getDb } from "~/lib/db.server";
import { SLOTS, SLOT_BY_KEY } from "~/lib/packages/slots";
import { formatHundredths } from "~/lib/quotes/display";
import { parseHundredths } from "~/lib/quotes/money";

// The shop's labour jobs: what a quote's labour is made of. Each job covers bench slots;
// a quote takes the cheapest set of jobs covering the slots a package changes.

// eslint-disable-next-line no-control-regex -- refusing control characters is the point
const CONTROL = /[\u0000-\u001f\u007f]/;

const JobSchema = z.object({
  intent: z.literal("save"),
  id: zId("Choose a job.").optional(),
  name: z
    .string({ error: "Name the job, e.g. Top end." })
    .trim()
    .min(2, "Name the job, e.g. Top end.")
    .max(80, "A job's name can be at most 80 characters.")
    .refine((s) => !CONTROL.test(s), "The name contains characters that cannot be stored."),
  hours: z
    .string({ error: "Enter the job's hours, e.g. 6.5." })
    .trim()
    .transform((s, ctx) => {
      const v = parseHundredths(s);
      if (v === null || v <= 0 || v > 100_000) {
        ctx.addIssue({
          code: "custom",
          message: "Enter the hours above 0 and at most 1,000, with up to two decimals.",
        });
        return z.NEVER;
      }
      return v;
    }),
  slots: z
    .array(z.string(), { error: "Choose the slots this job covers." })
    .min(1, "Choose at least one slot this job covers.")
    .refine(
      (keys) => keys.every((k) => Object.hasOwn(SLOT_BY_KEY, k)),
      "Choose slots from the list.",
    ),
  description: z
    .string()
    .trim()
    .max(300, "Keep the description to 300 characters.")
    .optional()
    .default(""),
});

export async function loader({ request }: Route.LoaderArgs) {
  await requirePermission(request, "jobs:edit");
  const jobs = await getDb()
    .selectFrom("labour_jobs as j")
    .leftJoin("users as u", "u.id", "j.updated_by")
    .select([
      "j.id",
      "j.name",
      "j.hours_hundredths",
      "j.slots",
      "j.description",
      "j.updated_at",
      "u.name as updated_by",
    ])
    .where("j.active", "=", true)
    .orderBy("j.name")
    .execute();
  return {
    jobs: jobs.map((j) => ({ ...j, updated_at: new Date(j.updated_at).toISOString() })),
    slots: SLOTS.map((s) => ({ key: s.key, label: s.label })),
  };
}

type ActionData = { form: string; result: SubmissionResult<string[]> };

export async function action({ request }: Route.ActionArgs) {
  const formData = await readForm(request);
  const user = await requirePermission(request, "jobs:edit");
  const db = getDb();
  const intent = formData.get("intent");
  if (intent === "retire") {
    const id = zId("Choose a job.").safeParse(formData.get("id"));
    if (!id.success)
      return data<ActionData>(
        { form: "retire", result: { status: "error", error: { "": ["Choose a job."] } } },
        { status: 400 },
      );
    await db
      .updateTable("labour_jobs")
      .set({ active: false, updated_by: user.id, updated_at: sql`now()` })
      .where("id", "=", id.data)
      .execute();
    return data<ActionData>({ form: "retire", result: { status: "success" } });
  }
  const submission = parseWithZod(formData, { schema: JobSchema });
  const formId = String(formData.get("id") ?? "new");
  if (submission.status !== "success")
    return data<ActionData>({ form: formId, result: submission.reply() }, { status: 400 });
  const v = submission.value;
  const clash = await db
    .selectFrom("labour_jobs")
    .select("id")
    .where(sql<boolean>`lower(name) = lower(${v.name})`)
    .where("active", "=", true)
    .executeTakeFirst();
  if (clash && clash.id !== v.id)
    return data<ActionData>(
      {
        form: formId,
        result: submission.reply({
          fieldErrors: { name: ["The shop already has a job with this name."] },
        }),
      },
      { status: 400 },
    );
  const values = {
    name: v.name,
    hours_hundredths: v.hours,
    slots: v.slots,
    description: v.description,
    updated_by: user.id,
    updated_at: new Date(),
  };
  if (v.id)
    await db
      .updateTable("labour_jobs")
      .set(values)
      .where("id", "=", v.id)
      .where("active", "=", true)
      .execute();
  else await db.insertInto("labour_jobs").values(values).execute();
  return data<ActionData>({ form: formId, result: submission.reply({ resetForm: !v.id }) });
}

type Job = Route.ComponentProps["loaderData"]["jobs"][number];

function JobForm({ job, slots }: { job: Job | null; slots: { key: string; label: string }[] }) {
  const actionData = useActionData<ActionData>();
  const navigation = useNavigation();
  const formId = job ? String(job.id) : "new";
  const last = actionData?.form === formId ? actionData.result : undefined;
  const [form, fields] = useForm({
    id: `job-${formId}`,
    lastResult: navigation.state === "idle" ? last : undefined,
    defaultValue: job
      ? {
          name: job.name,
          hours: formatHundredths(job.hours_hundredths),
          slots: job.slots,
          description: job.description,
        }
      : { slots: [] },
    onValidate: ({ formData }) => parseWithZod(formData, { schema: JobSchema }),
    shouldValidate: "onSubmit",
    shouldRevalidate: "onInput",
  });
  const chosen = (fields.slots.initialValue as string[] | undefined) ?? [];
  return (
    <Form
      method="post"
      {...getFormProps(form)}
      className="space-y-3 rounded border border-steel-200 bg-white p-4"
    >
      <FormAlert id={form.errorId} errors={formErrorsOf(form, last)} />
      <input type="hidden" name="intent" value="save" />
      {job ? <input type="hidden" name="id" value={job.id} /> : null}
      <div className="grid gap-3 sm:grid-cols-[2fr_1fr]">
        <TextField field={fields.name} label="Job" />
        <TextField field={fields.hours} label="Hours" hint="At the shop's labour rate" />
      </div>
      <fieldset aria-describedby={fields.slots.errorId}>
        <legend className="text-sm font-semibold text-graphite">Slots it covers</legend>
        <div className="mt-1 grid grid-cols-1 gap-1 sm:grid-cols-3">
          {slots.map((s) => (
            <label key={s.key} className="flex items-center gap-2 text-sm">
              <input
                {...getInputProps(fields.slots, { type: "checkbox", value: s.key })}
                key={`${formId}-${s.key}`}
                defaultChecked={chosen.includes(s.key)}
                className="h-4 w-4 accent-teal"
              />
              {s.label}
            </label>
          ))}
        </div>
        <FieldErrors id={fields.slots.errorId} errors={fields.slots.errors} />
      </fieldset>
      <TextField field={fields.description} label="What it includes (optional)" />
      <SubmitButton look={job ? "secondary" : "primary"} busy={navigation.state === "submitting"}>
        {job ? "Save the job" : "Add the job"}
      </SubmitButton>
    </Form>
  );
}

export default function LabourJobs({ loaderData }: Route.ComponentProps) {
  const { jobs, slots } = loaderData;
  return (
    <main className="mx-auto max-w-4xl px-4 py-8">
      <PageHeader
        back={{ to: "/settings", label: "Shop settings" }}
        title="Labour jobs"
        lead="A quote's labour comes from these jobs: the cheapest set that covers every slot a package changes, so parts fitted in one job are not charged twice. A part's own fitting time is used only where no job covers its slot."
      />
      <section className="mt-6 space-y-4" aria-label="The shop's jobs">
        {jobs.length === 0 ? (
          <p className="text-steel-700">The shop has no jobs yet; add the first below.</p>
        ) : null}
        {jobs.map((j) => (
          <div key={j.id}>
            <JobForm job={j} slots={slots} />
            <Form method="post" className="mt-1 text-right">
              <input type="hidden" name="intent" value="retire" />
              <input type="hidden" name="id" value={j.id} />
              <span className="mr-3 text-xs text-steel-700">
                Last changed{" "}
                {new Date(j.updated_at).toLocaleString("en-US", {
                  dateStyle: "medium",
                  timeStyle: "short",
                })}
                {j.updated_by ? ` by ${j.updated_by}` : ""}
              </span>
              <button type="submit" className="text-sm text-teal-text underline">
                Retire this job
              </button>
            </Form>
          </div>
        ))}
      </section>
      <section className="mt-8" aria-labelledby="new-job">
        <h2 id="new-job" className="text-xl font-semibold text-ink">
          New job
        </h2>
        <div className="mt-2">
          <JobForm job={null} slots={slots} />
        </div>
      </section>
    </main>
  );
}

export function meta() {
  return [{ title: "Labour jobs · Torquewright" }];
}
