#!/usr/bin/env node
// Thin launcher: the CLI is written in TypeScript under src/ and compiled to build/ by `npm run build:cli`
// (run automatically by `npm install` through the prepare script).
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';

const entry = new URL('../build/cli/cli.js', import.meta.url);
if (!existsSync(fileURLToPath(entry))) {
  process.stderr.write('gainwright: the CLI is not built yet; run `npm run build:cli` (npm install does it for you).\n');
  process.exit(2);
}
const { main } = await import(entry.href);
process.exitCode = await main(process.argv.slice(2));
