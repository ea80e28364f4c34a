/**
 * Checks for the Debian packages the system suites need. A missing package fails the suite with the
 * command that installs it; these suites never skip silently.
 */
import { execFileSync } from 'node:child_process';
import { existsSync } from 'node:fs';

/** Debian's Python with VTK's bindings (package python3-vtk9). */
export const VTK_PYTHON = '/usr/bin/python3';

/** Throws unless `/usr/bin/python3` can import vtk. */
export function requireVtkPython(): void {
  try {
    execFileSync(VTK_PYTHON, ['-c', 'import vtk'], { stdio: 'pipe' });
  } catch {
    throw new Error('VTK reference suites need python3-vtk9 in /usr/bin/python3: install with: apt-get install -y python3-vtk9');
  }
}

/** Debian's chromium binary. */
export const CHROMIUM = '/usr/bin/chromium';

/** Throws unless Debian's chromium is installed. */
export function requireChromium(): void {
  if (!existsSync(CHROMIUM)) throw new Error('browser suites need Debian\'s chromium at /usr/bin/chromium: install with: apt-get install -y chromium');
}

/** Runs a reference script with Debian's Python; returns stdout. Throws with stderr on failure. */
export function runVtkScript(script: string, args: string[] = []): string {
  requireVtkPython();
  try {
    return execFileSync(VTK_PYTHON, [script, ...args], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'], maxBuffer: 256 * 1024 * 1024 });
  } catch (e) {
    const err = e as { stderr?: string; stdout?: string; message: string };
    throw new Error(`${script} failed: ${err.stdout ?? ''}${err.stderr ?? err.message}`);
  }
}
