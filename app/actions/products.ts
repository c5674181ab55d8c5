"use server";

import { redirect } from "next/navigation";
import { bareProductSchema } from "@/lib/thermal/product";
import { createDefinition } from "@/lib/db/definitions";
import { fieldErrors, formValues, numberField, textField, type FormState } from "@/lib/validation";

/** Reads the product form into the product definition shape (SI units) and validates it. */
export async function createProduct(_prev: FormState, form: FormData): Promise<FormState> {
  const candidate = {
    name: textField(form, "name") ?? "",
    mass_kg: numberField(form, "mass_kg"),
    properties: {
      cp_J_kgK: numberField(form, "cp_J_kgK"),
      density_kg_m3: numberField(form, "density_kg_m3"),
      k_W_mK: numberField(form, "k_W_mK"),
    },
    area_m2: numberField(form, "area_m2"),
    h_W_m2K: numberField(form, "h_W_m2K"),
    initial_C: numberField(form, "initial_C"),
  };
  const parsed = bareProductSchema.safeParse(candidate);
  if (!parsed.success) return { fieldErrors: fieldErrors(parsed.error), values: formValues(form) };
  await createDefinition("product", parsed.data);
  redirect("/products?saved=1");
}
