import { z } from "zod";
import { tracesWithSha256 } from "@/lib/db/traces";
import { guardRoute } from "@/app/guard";

export const dynamic = "force-dynamic";

const sha256Schema = z.string().regex(/^[0-9a-fA-F]{64}$/, { message: "sha256 must be 64 hexadecimal digits" });

/** Stored traces whose original bytes have this SHA-256: the uploader warns before the same file is stored twice. */
export const GET = guardRoute("read", async (_req: Request, { params }: { params: Promise<{ sha256: string }> }) => {
  const parsed = sha256Schema.safeParse((await params).sha256);
  if (!parsed.success) return Response.json({ error: parsed.error.issues[0]!.message, field: "sha256" }, { status: 400 });
  const matches = await tracesWithSha256(parsed.data);
  return Response.json({ matches: matches.map((t) => ({ id: t.id, name: t.name, fileName: t.fileName, createdAt: t.createdAt.toISOString() })) });
});
