// Builds the command-line bundle once before the tests, so that CLI tests run the real artifact.
export default async function setup(): Promise<void> {
  // @ts-expect-error: a plain ESM build script without type declarations
  const { buildCli } = (await import("../scripts/build-cli.mjs")) as { buildCli: () => Promise<void> };
  await buildCli();
}
