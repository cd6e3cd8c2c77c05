import { getFormProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, redirect, useNavigation } from "react-router";
import type { Route } from "./+types/build-request";
import { ChoiceGroup } from "~/components/requests/choice-group";
import { FormAlert, formErrorsOf } from "~/components/ui/alert";
import { SubmitButton } from "~/components/ui/button";
import { CheckboxField, SelectField, TextAreaField, TextField } from "~/components/ui/field";
import { Honeypot } from "~/components/ui/honeypot";
import { honeypotStamp, trippedHoneypot } from "~/lib/auth/honeypot.server";
import { requireSameOrigin } from "~/lib/auth/origin.server";
import { clientAddress } from "~/lib/auth/throttle.server";
import { getDb } from "~/lib/db.server";
import { listFamilies } from "~/lib/engine-families/families.server";
import { familyYears } from "~/lib/engine-families/family";
import {
  createBuildRequest,
  familyExists,
  overRequestLimit,
  readFormBody,
} from "~/lib/requests/intake.server";
import { BUDGETS, CONTACT_BY, RIDING, TIME_FRAMES } from "~/lib/requests/options";
import { BuildRequestSchema } from "~/lib/requests/request-form";

export async function loader(_: Route.LoaderArgs) {
  const db = getDb();
  const [families, shop] = await Promise.all([
    listFamilies(db),
    db.selectFrom("shop").select(["name", "phone"]).orderBy("id").limit(1).executeTakeFirst(),
  ]);
  return {
    ...honeypotStamp(),
    shop: shop ?? null,
    families: families.map((f) => ({
      value: String(f.id),
      label: `${f.name} (${familyYears(f)})`,
    })),
  };
}

export async function action({ request }: Route.ActionArgs) {
  requireSameOrigin(request);
  const formData = await readFormBody(request);
  // a script that trips the honeypot sees the usual thank-you page; nothing is stored
  if (trippedHoneypot(formData)) return redirect("/build-request/thanks");
  const submission = parseWithZod(formData, { schema: BuildRequestSchema });
  if (submission.status !== "success") return data({ result: submission.reply() }, { status: 400 });
  const db = getDb();
  const v = submission.value;
  if (v.engineFamily !== "unsure" && !(await familyExists(db, Number(v.engineFamily))))
    return data(
      {
        result: submission.reply({
          fieldErrors: { engineFamily: ["Pick an engine from the list, or “Not sure”"] },
        }),
      },
      { status: 400 },
    );
  const address = clientAddress(request);
  if (await overRequestLimit(db, address))
    return data(
      {
        result: submission.reply({
          formErrors: [
            "We already have several requests from this connection in the last hour. Please try again later or call the shop.",
          ],
        }),
      },
      { status: 429 },
    );
  await createBuildRequest(db, v, address);
  return redirect("/build-request/thanks");
}

export default function BuildRequest({ loaderData, actionData }: Route.ComponentProps) {
  const navigation = useNavigation();
  const [form, fields] = useForm({
    lastResult: actionData?.result,
    onValidate: ({ formData }) => parseWithZod(formData, { schema: BuildRequestSchema }),
    shouldValidate: "onSubmit",
    shouldRevalidate: "onBlur",
  });
  const families = [...loaderData.families, { value: "unsure", label: "Not sure" }];
  return (
    <main className="mx-auto max-w-4xl px-4 py-8">
      <p className="text-sm font-semibold uppercase tracking-widest text-steel-700">
        {loaderData.shop?.name ?? "Engine program"}
      </p>
      <h1 className="mt-1 text-3xl font-semibold text-ink">Ask for a build</h1>
      <p className="mt-2 max-w-2xl text-graphite">
        Tell us about you, the bike and what you want it to do. No account needed; we get back to
        you before anything is planned or priced.
      </p>
      <Form
        method="post"
        {...getFormProps(form)}
        className="mt-6 space-y-6 rounded border border-steel-200 bg-white p-4 sm:p-6"
      >
        <FormAlert id={form.errorId} errors={formErrorsOf(form, actionData?.result)} />
        <Group title="You">
          <TextField label="Name" field={fields.name} autoComplete="name" />
          <TextField label="E-mail" field={fields.email} type="email" autoComplete="email" />
          <TextField
            label="Phone"
            field={fields.phone}
            autoComplete="tel"
            hint="Needed if you want a call or a text."
          />
          <SelectField
            label="How should we contact you?"
            field={fields.contactBy}
            options={CONTACT_BY}
            placeholder="Pick one"
          />
        </Group>
        <Group title="The bike">
          <TextField label="Model year" field={fields.bikeYear} type="number" step="1" />
          <SelectField
            label="Engine"
            field={fields.engineFamily}
            options={families}
            placeholder="Pick the engine"
          />
          <TextField
            label="Model"
            field={fields.bikeModel}
            hint="As you would call it, e.g. “Longhaul LT, black”."
          />
          <TextField label="Mileage (miles)" field={fields.mileage} type="number" step="1" />
        </Group>
        <Group title="What is on it now" wide>
          <TextAreaField
            label="Parts that are not as the bike came (one a line)"
            field={fields.currentParts}
            rows={4}
            hint="e.g. “big-bore kit two years ago”, “aftermarket exhaust”. Leave it empty if it is stock."
          />
        </Group>
        <Group title="What you want" wide>
          <TextAreaField
            label="What should the bike do?"
            field={fields.goals}
            rows={4}
            hint="In your words: passing power, pulling a passenger up mountain passes, a few track days…"
          />
          <ChoiceGroup
            legend="How you ride"
            field={fields.riding}
            options={RIDING}
            type="checkbox"
          />
        </Group>
        <Group title="Budget and timing">
          <SelectField
            label="Budget range"
            field={fields.budget}
            options={BUDGETS}
            placeholder="Pick a range"
          />
          <SelectField
            label="When do you want it done?"
            field={fields.timeFrame}
            options={TIME_FRAMES}
            placeholder="Pick a time frame"
          />
        </Group>
        <div className="border-t border-steel-200 pt-4">
          <CheckboxField
            field={fields.consent}
            label="You may contact me about this request the way I picked above."
          />
          {fields.consent.errors ? (
            <p id={fields.consent.errorId} className="mt-1 text-sm font-medium text-red-text">
              {fields.consent.errors.join(" ")}
            </p>
          ) : null}
          <p className="mt-2 text-sm text-steel-700">
            We use your details only to answer this request and to keep a record of your bike if you
            become a customer.
          </p>
        </div>
        <Honeypot stamp={loaderData.stamp} />
        <SubmitButton busy={navigation.state !== "idle"}>Send the request</SubmitButton>
      </Form>
    </main>
  );
}

function Group({
  title,
  wide,
  children,
}: {
  title: string;
  wide?: boolean;
  children: React.ReactNode;
}) {
  return (
    <fieldset>
      <legend className="text-lg font-semibold text-ink">{title}</legend>
      <div className={`mt-2 grid gap-4 ${wide ? "" : "sm:grid-cols-2"}`}>{children}</div>
    </fieldset>
  );
}

export function meta(_: Route.MetaArgs) {
  return [{ title: "Ask for a build · Torquewright" }];
}
