/**
 * src/cli/run.ts ends the process with `process.exit` once stdout and stderr are flushed: output larger than
 * a pipe's buffer still arrives whole, the exit codes are the verbs' own, and errors still print their
 * message. Reference for the cut's number: Hagen–Poiseuille flow (White, Viscous Fluid Flow, 3rd ed., 2006,
 * §3-3; docs/references.md §1): p = G(L − z) is linear, so the area-mean pressure over the cut at z = L/2 is
 * G·L/2 = 0.20032 Pa exactly on any mesh of the bundled pipe.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.ts';

const REPO = resolve(__dirname, '../..');
const PIPE = join(REPO, 'sample-fields/pipe-medium.vtu');
const work = mkdtempSync(join(tmpdir(), 'fieldtally-exit-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

/** The command from the clone, its output read through pipes. */
const bin = (args: string[]) => spawnSync(process.execPath, [join(REPO, 'bin', 'fieldtally.mjs'), ...args], { cwd: work, encoding: 'utf8', maxBuffer: 64 << 20 });

async function inProcess(args: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '', err = '';
  const code = await main(args, { out: (t) => { out += t.endsWith('\n') ? t : t + '\n'; }, err: (t) => { err += t.endsWith('\n') ? t : t + '\n'; } });
  return { code, out, err };
}

describe('the command leaves once its output is flushed', () => {
  it('prints the same numbers as the verb run in this process, and exit code 0', async () => {
    const args = ['cut', PIPE, '--origin', '0,0,0.05', '--normal', '0,0,1'];
    const r = bin(args), expected = await inProcess(args);
    expect([r.status, r.stderr]).toEqual([0, '']);
    expect(r.stdout).toBe(expected.out);
    expect(r.stdout).toMatch(/static pressure p +area mean 0\.20032 /);
  }, 60_000);

  it('writes an output several times a pipe buffer whole (about 380 kB of line samples)', async () => {
    const args = ['line', join(REPO, 'sample-fields/pipe-coarse.vtu'), '--from', '0,0,0', '--to', '0,0,0.1', '--samples', '5000', '--csv'];
    const r = bin(args), expected = await inProcess(args);
    expect(r.status).toBe(0);
    expect(r.stdout.length).toBeGreaterThan(300_000);
    expect(r.stdout).toBe(expected.out);
  }, 60_000);

  it('prints the message of a bad file, a bad plane and an unknown verb, and exits non-zero', () => {
    const missing = bin(['cut', join(work, 'missing.vtu'), '--origin', '0,0,0', '--normal', '0,0,1']);
    expect([missing.status, missing.stdout]).toEqual([1, '']);
    expect(missing.stderr).toMatch(/^fieldtally cut: .*missing\.vtu: cannot read file \(no such file or folder\)\n$/);
    const truncated = join(work, 'truncated.vtu');
    writeFileSync(truncated, '<VTKFile');
    const bad = bin(['cut', truncated, '--origin', '0,0,0', '--normal', '0,0,1']);
    expect([bad.status, bad.stdout]).toEqual([1, '']);
    expect(bad.stderr).toMatch(/^fieldtally cut: truncated\.vtu: file ends inside .* at byte 0; expected the rest of the XML \(is the file truncated\?\)\n$/);
    const plane = bin(['cut', PIPE, '--origin', '0,0,x', '--normal', '0,0,1']);
    expect([plane.status, plane.stdout, plane.stderr]).toEqual([1, '', 'fieldtally cut: --origin: expected component z of x,y,z written as a decimal number, got "0,0,x"\n']);
    const verb = bin(['cutt']);
    expect(verb.status).toBe(2);
    expect(verb.stderr).toMatch(/^fieldtally: unknown verb "cutt"/);
  }, 60_000);
});
