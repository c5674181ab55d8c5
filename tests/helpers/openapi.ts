// Validates a JSON value against a schema inside the OpenAPI document, with Ajv (JSON Schema 2020-12, the
// dialect of OpenAPI 3.1): the document's own `$ref`s to components resolve inside it. Formats are
// annotations here (no ajv-formats); zod checks them on the server.
import Ajv2020 from "ajv/dist/2020";

export type Doc = { paths?: Record<string, Record<string, unknown>>; components?: unknown };

const escape = (s: string) => s.replace(/~/g, "~0").replace(/\//g, "~1");

export function documentValidator(doc: Doc) {
  const ajv = new Ajv2020({ strict: false, validateFormats: false, allErrors: false });
  ajv.addSchema({ ...doc, $id: "doc.json" });
  const compiled = new Map<string, ReturnType<typeof ajv.compile>>();
  const at = (pointer: string) => {
    let v = compiled.get(pointer);
    if (!v) compiled.set(pointer, (v = ajv.compile({ $ref: `doc.json#${pointer}` })));
    return v;
  };
  const check = (pointer: string, value: unknown): string | null => {
    const v = at(pointer);
    return v(value) ? null : ajv.errorsText(v.errors);
  };
  return {
    /** null when `value` matches the response schema of METHOD PATH STATUS (content type), else Ajv's message */
    response: (method: string, path: string, status: number, value: unknown, type = "application/json") =>
      check(`/paths/${escape(path)}/${method}/responses/${status}/content/${escape(type)}/schema`, value),
    request: (method: string, path: string, value: unknown, type = "application/json") =>
      check(`/paths/${escape(path)}/${method}/requestBody/content/${escape(type)}/schema`, value),
  };
}
