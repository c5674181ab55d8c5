-- Monitors made before this migration keep their device token as a device API token bound to the monitor,
-- owned by the first administrator (see the SQLite migration for why).
INSERT INTO "ApiToken" ("id", "name", "userId", "scope", "prefix", "tokenSha256", "createdAt", "monitorId")
SELECT replace(gen_random_uuid()::text, '-', ''), left('device: ' || m."name", 120), a."id", 'device', 'cmd_', m."deviceTokenSha256", m."createdAt", m."id"
FROM "Monitor" m
CROSS JOIN (SELECT "id" FROM "User" WHERE "role" = 'admin' AND NOT "disabled" ORDER BY "createdAt", "id" LIMIT 1) a
WHERE NOT EXISTS (SELECT 1 FROM "ApiToken" t WHERE t."tokenSha256" = m."deviceTokenSha256");
