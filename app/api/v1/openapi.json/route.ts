import { guardRoute } from "@/app/guard";
import { openApiDocument } from "@/lib/api/openapi";
import { health } from "@/lib/services/api";
import { api } from "../_lib/apiRoute";

export const dynamic = "force-dynamic";

let doc: ReturnType<typeof openApiDocument> | undefined;

/** The OpenAPI 3.1 document, generated from the zod schemas the handlers validate with (built once). */
export const GET = guardRoute("read", api(async () => Response.json((doc ??= openApiDocument(health().version)))));
