import { zId } from "~/lib/http/ids";
import { readQuery } from "~/lib/http/text";
import { readForm } from "~/lib/http/body";
import { getFormProps, getInputProps, getSelectProps, useForm } from "@conform-to/react";
import { parseWithZod } from "@conform-to/zod/v4";
import { data, Form, redirect } from "react-router";
import { z } from "zod";
import type { Route } from "./+types/packages.new";
import { requirePermission } from "~/lib/auth/auth.server";
import { getDb } from "~/lib/db.server";
import { createPackage } from "~/lib/packages/store.server";
import { startingSpecForBike } from "~/lib/packages/from-bike.server";

const NewPackageSchema = z.discriminatedUnion("mode", [
  z.object({
    mode: z.literal("scratch"),
    name: z
      .string({ error: "Give the package a name" })
      .trim()
      .min(2, "Give the package a name")
      .max(120),
    bikeId: zId("Pick the bike"),
  }),
  z.object({
    mode: z.literal("template"),
    name: z
      .string({ error: "Give the package a name" })
      .trim()
      .min(2, "Give the package a name")
      .max(120),
    bikeId: zId("Pick the bike"),
    sourceId: zId("Pick a template"),
  }),
  z.object({
    mode: z.literal("copy"),
    name: z
      .string({ error: "Give the package a name" })
      .trim()
      .min(2, "Give the package a name")
      .max(120),
    bikeId: zId("Pick the bike"),
    sourceId: zId("Pick the package to copy"),
  }),
  z.object({
    mode: z.literal("new-template"),
    name: z
      .string({ error: "Give the template a name" })
      .trim()
      .min(2, "Give the template a name")
      .max(120),
  }),
]);

export async function loader({ request }: Route.LoaderArgs) {
  await requirePermission(request, "packages:create");
  const db = getDb();
  const query = readQuery(request);
  const [bikes, sources] = await Promise.all([
    db
      .selectFrom("bikes as b")
      .innerJoin("customers as c", "c.id", "b.customer_id")
      .select(["b.id", "b.year", "b.model", "c.name as customer"])
      .orderBy("c.name")
      .execute(),
    db
      .selectFrom("packages")
      .select(["id", "name", "is_template"])
      .orderBy("is_template", "desc")
      .orderBy("name")
      .execute(),
  ]);
  return {
    bikes,
    sources,
    preset: {
      bikeId: query.get("bike") ?? "",
      mode: query.get("mode") ?? "scratch",
    },
  };
}

export async function action({ request }: Route.ActionArgs) {
  const user = await requirePermission(request, "packages:create");
  const formData = await readForm(request);
  const submission = parseWithZod(formData, { schema: NewPackageSchema });
  if (submission.status !== "success") return data({ result: submission.reply() }, { status: 400 });
  const db = getDb();
  const v = submission.value;
  let spec: unknown;
  if (v.mode === "template" || v.mode === "copy") {
    const src = await db
      .selectFrom("packages")
      .select(["spec", "is_template"])
      .where("id", "=", v.sourceId)
      .executeTakeFirst();
    if (!src || (v.mode === "template" && !src.is_template)) {
      return data(
        {
          result: submission.reply({
            fieldErrors: {
              sourceId: [
                v.mode === "template"
                  ? "That is not a shop template"
                  : "That package no longer exists",
              ],
            },
          }),
        },
        { status: 400 },
      );
    }
    spec = src.spec;
  }
  if (v.mode !== "new-template") {
    const bike = await db
      .selectFrom("bikes")
      .select("id")
      .where("id", "=", v.bikeId)
      .executeTakeFirst();
    if (!bike)
      return data(
        { result: submission.reply({ fieldErrors: { bikeId: ["That bike is not on file"] } }) },
        { status: 400 },
      );
  }
  // a bike's package starts from its engine family's stock parts and what it carries now
  if (v.mode === "scratch") spec = await startingSpecForBike(db, v.bikeId);
  const id = await createPackage(
    db,
    {
      name: v.name,
      bikeId: v.mode === "new-template" ? null : v.bikeId,
      isTemplate: v.mode === "new-template",
      builderId: user.role === "builder" || user.role === "owner" ? user.id : null,
      spec,
      copiedFromId: v.mode === "template" || v.mode === "copy" ? v.sourceId : null,
      change:
        v.mode === "scratch" || v.mode === "new-template"
          ? "Package started"
          : `Started from package #${v.sourceId}`,
    },
    user.id,
  );
  return redirect(`/packages/${id}/bench`);
}

export default function NewPackage({ loaderData, actionData }: Route.ComponentProps) {
  const [form, fields] = useForm({
    lastResult: actionData?.result,
    defaultValue: { mode: loaderData.preset.mode, bikeId: loaderData.preset.bikeId },
    onValidate: ({ formData }) => parseWithZod(formData, { schema: NewPackageSchema }),
    shouldRevalidate: "onBlur",
  });
  const mode = String(fields.mode.value ?? "scratch");
  const sources = loaderData.sources.filter((s) =>
    mode === "template" ? s.is_template : mode === "copy" ? !s.is_template : false,
  );
  const err = (f: { errorId: string; errors?: string[] }) =>
    f.errors ? (
      <p id={f.errorId} className="mt-0.5 text-sm text-red-text">
        {f.errors.join(" ")}
      </p>
    ) : null;
  return (
    <main className="mx-auto max-w-2xl px-4 py-6">
      <h1 className="text-3xl font-semibold text-ink">New package</h1>
      <Form
        method="post"
        {...getFormProps(form)}
        className="mt-4 flex flex-col gap-4 rounded border border-steel-200 bg-white p-4"
      >
        <fieldset>
          <legend className="text-sm font-semibold text-ink">Start</legend>
          {[
            ["scratch", "From scratch, for a bike"],
            ["template", "From a shop template"],
            ["copy", "As a copy of another package"],
            ["new-template", "A new shop template (no bike)"],
          ].map(([v, l]) => (
            <label key={v} className="mt-1 flex items-center gap-2 text-sm">
              <input type="radio" name={fields.mode.name} value={v} defaultChecked={mode === v} />
              {l}
            </label>
          ))}
        </fieldset>
        <div>
          <label htmlFor={fields.name.id} className="block text-sm font-medium">
            Name
          </label>
          <input
            {...getInputProps(fields.name, { type: "text" })}
            className="mt-0.5 w-full rounded border border-steel-300 px-2 py-1"
            placeholder="e.g. Highway passing power, stage 3"
          />
          {err(fields.name)}
        </div>
        {mode !== "new-template" ? (
          <div>
            <label htmlFor={fields.bikeId.id} className="block text-sm font-medium">
              Bike
            </label>
            <select
              {...getSelectProps(fields.bikeId)}
              className="mt-0.5 w-full rounded border border-steel-300 px-2 py-1"
            >
              <option value="">— pick the customer's bike —</option>
              {loaderData.bikes.map((b) => (
                <option key={b.id} value={b.id}>
                  {b.customer} · {b.year} {b.model}
                </option>
              ))}
            </select>
            {err(fields.bikeId)}
          </div>
        ) : null}
        {mode === "template" || mode === "copy" ? (
          <div>
            <label htmlFor={fields.sourceId.id} className="block text-sm font-medium">
              {mode === "template" ? "Template" : "Package to copy"}
            </label>
            <select
              {...getSelectProps(fields.sourceId)}
              className="mt-0.5 w-full rounded border border-steel-300 px-2 py-1"
            >
              <option value="">— pick —</option>
              {sources.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.name}
                </option>
              ))}
            </select>
            {err(fields.sourceId)}
          </div>
        ) : null}
        <button
          type="submit"
          className="self-start rounded bg-teal-dark px-4 py-1.5 font-semibold text-white hover:bg-ink"
        >
          Create and open the bench
        </button>
      </Form>
    </main>
  );
}

export function meta() {
  return [{ title: "New package · Torquewright" }];
}
