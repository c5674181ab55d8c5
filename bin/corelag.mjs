#!/usr/bin/env node
// `npx corelag …` after install: the bundle made by postinstall (scripts/build-cli.mjs).
import "../dist/cli/corelag.mjs";
