import { FormMessage } from "@/app/components/Field";
import type { FormState } from "@/lib/validation";

/**
 * The end of every definition editor: the definition as one JSON field (validated as a whole by the
 * server action), the lineage when editing (so the save becomes a new version), the form's message
 * and the submit button.
 */
export function DefinitionFooter({ definition, editing, state, pending, noun, disabled }: {
  definition: unknown;
  editing?: { id: string; lineage: string };
  state: FormState;
  pending: boolean;
  noun: string;
  disabled?: boolean;
}) {
  return (
    <>
      <input type="hidden" name="definition" value={JSON.stringify(definition)} />
      <input type="hidden" name="lineage" value={editing?.lineage ?? ""} />
      <input type="hidden" name="editing" value={editing?.id ?? ""} />
      <FormMessage state={state} />
      <button type="submit" disabled={pending || disabled}>{pending ? "Saving…" : editing ? "Save new version" : `Save ${noun}`}</button>
    </>
  );
}
