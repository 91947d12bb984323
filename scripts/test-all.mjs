#!/usr/bin/env node
// `npm test`: type check, build the CLI, run the unit suites, then the browser suite (needs Chromium) and the
// simulator cross-check (needs ngspice). A missing system package is skipped with one line saying what to
// install, except under CI=true, where it is a failure. Prints one closing line: "tests: N passed, N failed".
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

const ci = process.env.CI === 'true';
const tmp = mkdtempSync(join(tmpdir(), 'gw-test-'));
let passed = 0, failed = 0;
const skipped = [];
const problems = [];

function step(name, cmd, args) {
  const r = spawnSync(cmd, args, { stdio: 'inherit', env: process.env });
  if (r.status !== 0) { problems.push(`${name} failed (exit ${r.status})`); return false; }
  return true;
}

function suite(name, config) {
  const out = join(tmp, `${name}.json`);
  const args = ['vitest', 'run', '--reporter=default', '--reporter=json', `--outputFile=${out}`];
  if (config) args.push('--config', config);
  const r = spawnSync('npx', args, { stdio: 'inherit', env: process.env });
  if (existsSync(out)) {
    const j = JSON.parse(readFileSync(out, 'utf8'));
    passed += j.numPassedTests; failed += j.numFailedTests;
    if (j.numTotalTests === 0) problems.push(`${name}: no tests ran`);
  } else {
    problems.push(`${name}: the test runner produced no results`);
  }
  if (r.status !== 0) problems.push(`${name} suite failed (exit ${r.status})`);
}

const has = (bin) => spawnSync('sh', ['-c', `command -v ${bin}`], { stdio: 'ignore' }).status === 0;
const chromium = process.env.CHROMIUM_PATH || '/usr/bin/chromium';

step('typecheck', 'npx', ['tsc', '--noEmit', '-p', 'tsconfig.json']);
step('build:cli', 'npx', ['tsc', '-p', 'tsconfig.cli.json']);
suite('unit');

if (existsSync(chromium)) {
  if (step('build', 'npx', ['vite', 'build', '--logLevel', 'warn'])) suite('e2e', 'vitest.e2e.config.ts');
} else if (ci) {
  problems.push(`Chromium is missing at ${chromium}: CI must install it (apt-get install -y chromium)`);
} else {
  skipped.push('browser tests (install Chromium: apt-get install -y chromium)');
}

if (has('ngspice')) {
  if (existsSync('vitest.spice.config.ts')) suite('spice', 'vitest.spice.config.ts');
} else if (ci) {
  problems.push('ngspice is missing: CI must install it (apt-get install -y ngspice)');
} else {
  skipped.push('simulator cross-check (install ngspice: apt-get install -y ngspice)');
}

if (skipped.length) console.log(`skipped: ${skipped.join('; ')}`);
for (const p of problems) console.log(`problem: ${p}`);
console.log(`tests: ${passed} passed, ${failed} failed`);
process.exit(problems.length || failed ? 1 : 0);
