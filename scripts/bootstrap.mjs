#!/usr/bin/env node
// Installs what a bare machine lacks before `npm start` / `npm test`: npm packages (native
// modules built from source), Debian ffmpeg, and for tests Debian chromium and postgresql. Plain Node, no deps.
import { execFileSync, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const forTests = process.argv.includes('--test');
const log = (msg) => console.log(`[bootstrap] ${msg}`);
const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;

function run(cmd, args, opts = {}) {
  log(`$ ${cmd} ${args.join(' ')}`);
  const r = spawnSync(cmd, args, { cwd: root, stdio: 'inherit', ...opts });
  if (r.status !== 0) {
    console.error(`[bootstrap] failed: ${cmd} ${args.join(' ')} (exit ${r.status ?? r.signal})`);
    process.exit(1);
  }
}

function has(cmd) {
  return spawnSync('sh', ['-c', `command -v ${cmd}`], { stdio: 'ignore' }).status === 0;
}

// 1. Node version.
const [major, minor] = process.versions.node.split('.').map(Number);
if (major < 20 || (major === 20 && minor < 19)) {
  console.error(`[bootstrap] Node ${process.versions.node} is too old: install Node 20.19 or newer.`);
  process.exit(1);
}

// 2. npm packages, when missing or older than the lock file.
const marker = path.join(root, 'node_modules', '.package-lock.json');
const lock = path.join(root, 'package-lock.json');
const stale = !fs.existsSync(marker) || fs.statSync(lock).mtimeMs > fs.statSync(marker).mtimeMs + 1000;
if (stale) {
  run('npm', ['ci', '--no-audit', '--no-fund', '--foreground-scripts=false']);
}

// 3. Native modules must load in this Node; argon2's bundled prebuilt is not trusted here, so
//    it is always compiled from source (node-gyp-build prefers build/Release when present).
function loads(code) {
  return spawnSync(process.execPath, ['-e', code], { cwd: root, stdio: 'ignore', timeout: 60_000 }).status === 0;
}
const argonBuilt = fs.existsSync(path.join(root, 'node_modules/argon2/build/Release/argon2.node'));
const argonOk = () => loads("require('argon2').hash('check').then(()=>process.exit(0),()=>process.exit(1))");
if (!argonBuilt || !argonOk()) {
  run('npm', ['rebuild', 'argon2'], { env: { ...process.env, npm_config_build_from_source: 'true' } });
  if (!argonOk()) {
    console.error('[bootstrap] argon2 does not load after a source build; check python3, make and g++.');
    process.exit(1);
  }
}
const sqliteOk = () => loads("const D=require('better-sqlite3'); new D(':memory:').prepare('select 1').get()");
if (!sqliteOk()) {
  run('npm', ['rebuild', 'better-sqlite3'], { env: { ...process.env, npm_config_build_from_source: 'true' } });
  if (!sqliteOk()) {
    console.error('[bootstrap] better-sqlite3 does not load; it needs version 12 on Node 20, and python3, make and g++.');
    process.exit(1);
  }
}

// 4. Debian packages.
const debs = [];
if (!has('ffmpeg') || !has('ffprobe')) debs.push('ffmpeg');
if (forTests && !fs.existsSync('/usr/bin/chromium')) debs.push('chromium');
if (forTests && !has('pdftotext')) debs.push('poppler-utils');
// The server suite runs a second time on a private PostgreSQL server (scripts/postgres-server.ts).
if (forTests && !fs.existsSync('/usr/lib/postgresql') && !has('pg_ctl')) debs.push('postgresql');
if (debs.length) {
  if (isRoot && has('apt-get')) {
    const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
    run('apt-get', ['update', '-q'], { env });
    run('apt-get', ['install', '-y', '-q', '--no-install-recommends', ...debs], { env });
  } else {
    console.error(
      `[bootstrap] Missing Debian packages: ${debs.join(', ')}.\n` +
        `Install them as root, e.g.: sudo apt-get update && sudo apt-get install -y ${debs.join(' ')}`,
    );
    process.exit(1);
  }
}

try {
  const v = execFileSync('ffmpeg', ['-hide_banner', '-version'], { encoding: 'utf8' }).split('\n')[0];
  log(`ready (${v})`);
} catch {
  log('ready');
}
