// The layering rule, enforced (run by `npm run lint`; the rules live in scripts/layers.ts).
import path from "node:path";
import { checkLayers, ENGINE_LAYERS } from "./layers";

const problems = checkLayers(path.resolve(__dirname, ".."));
if (problems.length) {
  console.error(problems.join("\n"));
  process.exit(1);
}
console.log(`layers: ok (engine ${Object.keys(ENGINE_LAYERS).join(" < ")} framework-free and imported only downwards; storage drivers only in lib/db)`);
