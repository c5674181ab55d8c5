"use client";

import { useActionState } from "react";
import { saveEffectivePackAction } from "@/app/actions/design";
import { Field, FormMessage } from "@/app/components/Field";
import type { FormState } from "@/lib/validation";

export function SaveEffectivePack(props: { traceId: string; productId: string; packId?: string; fitInitial: boolean; fitOffset: boolean; suggestedName: string }) {
  const [state, action, pending] = useActionState<FormState, FormData>(saveEffectivePackAction, {});
  return (
    <form action={action} className="stack" aria-label="Save as effective pack">
      <input type="hidden" name="traceId" value={props.traceId} />
      <input type="hidden" name="productId" value={props.productId} />
      <input type="hidden" name="packId" value={props.packId ?? ""} />
      <input type="hidden" name="fitInitial" value={props.fitInitial ? "1" : "0"} />
      <input type="hidden" name="fitOffset" value={props.fitOffset ? "1" : "0"} />
      <Field name="name" label="Name of the effective pack" defaultValue={props.suggestedName} state={state} />
      <FormMessage state={state} />
      <button type="submit" disabled={pending}>Save as effective pack</button>
    </form>
  );
}
