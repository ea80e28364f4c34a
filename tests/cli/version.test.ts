/** `fieldtally --version`: the version of package.json, in-process and through the command's entry script. */
import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { describe, expect, it } from 'vitest';
import { main } from '../../src/cli/main.ts';

const REPO = resolve(__dirname, '../..');
const VERSION = JSON.parse(readFileSync(resolve(REPO, 'package.json'), 'utf8')).version as string;

describe('fieldtally --version', () => {
  it('prints "fieldtally <version>" and exits 0, from main and from bin/fieldtally.mjs', async () => {
    expect(VERSION).toMatch(/^\d+\.\d+\.\d+/);
    for (const flag of ['--version', '-V']) {
      let out = '';
      expect(await main([flag], { out: (t) => { out += t; }, err: () => {} })).toBe(0);
      expect(out).toBe(`fieldtally ${VERSION}`);
    }
    const viaBin = execFileSync(process.execPath, [resolve(REPO, 'bin/fieldtally.mjs'), '--version'], { cwd: REPO, encoding: 'utf8' });
    expect(viaBin).toBe(`fieldtally ${VERSION}\n`);
  });
});
