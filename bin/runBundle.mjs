// Runs the command's bundle (CommonJS, bin/cliBundle.mjs) with a V8 code cache, for bin/fieldtally.mjs.
//
// Node 20 keeps no compile cache for ES modules (module.enableCompileCache came with Node 22.1), but a script
// compiled by `vm.Script` takes `cachedData`: the bytecode of the top level and of every function the run
// compiled, as V8 serialised it (`createCachedData`) at the end of an earlier run. With it the engine skips
// parsing and compiling them. Measured on a 2-core machine under load (CPU of whole processes, user + system):
// `cut` on a small file 204–220 → 181–190 ms, on the 1M-cell files 434–474 → 417–461 ms.
//
// One cache file per verb (each verb compiles other functions), in
// $TMPDIR/fieldtally-code-<uid>/<hash of the bundle's path, size and time and of Node's version>/<verb>.bin,
// written at the exit of a run that found none or had it rejected (another Node, other V8 flags): written to a
// temporary name and renamed. Folders not used for a week are removed when a cache is written. The folders must
// belong to this user and be writable by no one else, since the cache is code: otherwise the bundle is
// compiled from its source and nothing is written.
// FIELDTALLY_CODE_CACHE=0 turns the cache off; with FIELDTALLY_DEBUG the command says what it did with it.
import { lstatSync, mkdirSync, readdirSync, readFileSync, renameSync, rmSync, statSync, utimesSync, writeFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { tmpdir, userInfo } from 'node:os';
import { dirname, join } from 'node:path';
import { Script } from 'node:vm';
import zlib from 'node:zlib';

const debug = (text) => { if (process.env.FIELDTALLY_DEBUG) process.stderr.write(`fieldtally: code cache: ${text}\n`); };

/**
 * A 64-bit hash of the lines, as 16 hex digits: the CRC-32 of the lines in order and of the lines in reverse
 * order (zlib's, in native code: about 0.1 ms where the JavaScript hash below took 4–15 ms on the clone's source
 * stamp, since it runs once and is never optimised; node:zlib is loaded by the command anyway). Before Node 20.15, two FNV-1a hashes.
 */
export function hash64(lines) {
  const text = lines.join('\n');
  const { crc32 } = zlib;
  if (typeof crc32 === 'function') {
    const hex = (v) => (v >>> 0).toString(16).padStart(8, '0');
    return hex(crc32(text)) + hex(crc32(lines.slice().reverse().join('\n')));
  }
  let a = 0x811c9dc5, b = 0x050c5d1f;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    a = Math.imul(a ^ c, 0x01000193) >>> 0;
    b = Math.imul(b ^ c, 0x01000193) >>> 0;
    b = (b ^ (b >>> 13)) >>> 0;
  }
  return a.toString(16).padStart(8, '0') + b.toString(16).padStart(8, '0');
}

/** `dir`, created if missing (mode 700), when it is a folder of this user that no one else may write; else null. */
function ownFolder(dir) {
  try {
    mkdirSync(dir, { recursive: true, mode: 0o700 });
    const s = lstatSync(dir);
    const uid = typeof process.getuid === 'function' ? process.getuid() : s.uid;
    return s.isDirectory() && s.uid === uid && (s.mode & 0o022) === 0 ? dir : null;
  } catch {
    return null;
  }
}

/** Folders of caches not used for this long are removed (ms). */
const KEEP_UNUSED_MS = 7 * 24 * 3600 * 1000;

/** The folder all code caches of this user live in. */
export const cacheBase = () => join(tmpdir(), `fieldtally-code-${userInfo().uid}`);

/** The cache file of `verb` for the bundle `file` (stat `s`), or null when there is no safe place for it. */
export function cacheFile(file, s, verb) {
  const base = ownFolder(cacheBase());
  if (!base) return null;
  const dir = ownFolder(join(base, hash64([file, s.size, s.mtimeMs, process.version, process.arch])));
  if (!dir) return null;
  const now = new Date();
  try { utimesSync(dir, now, now); } catch { /* marks it used; not needed to run */ }
  const name = /^[a-z][a-z-]{0,31}$/.test(verb ?? '') ? verb : '_';
  return join(dir, `${name}.bin`);
}

/** Writes the script's code cache to `file` whole (temporary name, then rename), and removes folders unused for a week; best effort. */
function writeCache(script, file) {
  const part = `${file}.${process.pid}.tmp`;
  try {
    writeFileSync(part, script.createCachedData(), { mode: 0o600 });
    renameSync(part, file);
    debug(`written ${file}`);
  } catch (e) {
    rmSync(part, { force: true });
    debug(`not written (${e instanceof Error ? e.message : e})`);
  }
  const base = dirname(dirname(file)), now = Date.now();
  try {
    for (const name of readdirSync(base)) {
      const full = join(base, name);
      if (full !== dirname(file) && now - statSync(full).mtimeMs > KEEP_UNUSED_MS) rmSync(full, { recursive: true, force: true });
    }
  } catch { /* another process removed it first */ }
}

/**
 * Compiles the CommonJS bundle `file` (with the code cache of verb `args[0]` when there is one), runs its top
 * level and calls its `runCommand(args)`, which ends the process.
 */
export async function runBundle(file, args) {
  const source = readFileSync(file, 'utf8');
  const cache = process.env.FIELDTALLY_CODE_CACHE === '0' ? null : cacheFile(file, statSync(file), args[0]);
  let cachedData;
  if (cache) {
    try { cachedData = readFileSync(cache); } catch { /* none yet */ }
  }
  // the wrapper Node gives CommonJS files (the source starts on its first line, so line numbers hold)
  const script = new Script(`(function (exports, require, module, __filename, __dirname) { ${source}\n})`, { filename: file, cachedData });
  const used = cachedData !== undefined && !script.cachedDataRejected;
  debug(cachedData === undefined ? 'none' : used ? `used ${cache}` : `rejected ${cache}`);
  if (cache && !used) process.once('exit', () => writeCache(script, cache));
  const module = { exports: {} };
  script.runInThisContext().call(module.exports, module.exports, createRequire(file), module, file, dirname(file));
  await module.exports.runCommand(args);
}
