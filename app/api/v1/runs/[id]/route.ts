import { guardRoute } from "@/app/guard";
import { runForApi } from "@/lib/services/api";
import { api } from "../../_lib/apiRoute";
import { answered } from "../../_lib/params";

export const dynamic = "force-dynamic";

/** A background review run: its progress, and the stored review's id once done. */
export const GET = guardRoute("read", api<{ id: string }>(async (_req, { params }) => Response.json(answered(await runForApi(params.id)))));
