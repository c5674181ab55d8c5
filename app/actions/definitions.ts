"use server";

import { redirect } from "next/navigation";
import type { z } from "zod";
import { packSchema, productSchema } from "@/lib/thermal/definitions";
import { limitSetSchema } from "@/lib/exposure/limits";
import { profileSchema } from "@/lib/design/profile";
import { createDefinition, getDefinition, reviseDefinition, type DefinitionKind } from "@/lib/db/definitions";
import { isDiskFull } from "@/lib/db/errors";
import { fieldErrors, formValues, type FormState } from "@/lib/validation";
import { guardAction } from "@/app/guard";
import type { Actor } from "@/lib/access/actor";

/**
 * The definition editors post the whole definition as one JSON field (built in the browser from the
 * inputs); it is validated here as a whole and refused with a message per field path. With a lineage
 * the save is an edit: a new version, leaving the old one for the reviews that used it.
 */
async function save<S extends z.ZodType<{ name: string }>>(kind: DefinitionKind, schema: S, form: FormData, back: string, actor: Actor): Promise<FormState> {
  const values = formValues(form);
  let body: unknown;
  try {
    body = JSON.parse(String(form.get("definition") ?? ""));
  } catch {
    return { message: "the form could not be read; reload the page and try again", values };
  }
  const parsed = schema.safeParse(body);
  if (!parsed.success) return { fieldErrors: fieldErrors(parsed.error), values };
  const lineage = form.get("lineage");
  try {
    if (typeof lineage === "string" && lineage !== "") {
      const current = await getDefinition(String(form.get("editing") ?? ""));
      if (!current || current.lineage !== lineage || current.kind !== kind) return { message: "the definition being edited no longer exists", values };
      await reviseDefinition(lineage, parsed.data, actor);
    } else {
      await createDefinition(kind, parsed.data, actor);
    }
  } catch (e) {
    if (isDiskFull(e)) return { message: "the server's disk is full, so nothing was saved; free some space (or ask the administrator to) and save again", values };
    throw e;
  }
  redirect(`${back}?saved=1`);
}

export const saveProduct = guardAction("definition:edit", async (actor, _prev: FormState, form: FormData): Promise<FormState> => save("product", productSchema, form, "/products", actor));

export const savePack = guardAction("definition:edit", async (actor, _prev: FormState, form: FormData): Promise<FormState> => save("pack", packSchema, form, "/packs", actor));

export const saveLimitSet = guardAction("definition:edit", async (actor, _prev: FormState, form: FormData): Promise<FormState> => save("limits", limitSetSchema, form, "/limits", actor));

export const saveProfile = guardAction("definition:edit", async (actor, _prev: FormState, form: FormData): Promise<FormState> => save("profile", profileSchema, form, "/design/profiles", actor));
