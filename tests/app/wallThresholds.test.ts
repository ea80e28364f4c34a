/** The wall tool's y⁺ thresholds as typed in the panel. */
import { describe, expect, it } from 'vitest';
import { parseThresholds, WALL_PANEL_DEFAULTS } from '../../src/app/wallTool.ts';

describe('parseThresholds', () => {
  it('reads commas, semicolons or spaces; sorts and drops repeats', () => {
    expect(parseThresholds('5, 1')).toEqual([1, 5]);
    expect(parseThresholds('30;1 5 5')).toEqual([1, 5, 30]);
    expect(parseThresholds(' 0.5 ')).toEqual([0.5]);
  });

  it('refuses empty, negative or non-numeric input with one line', () => {
    for (const bad of ['', 'one', '1, -2', '1,,x']) expect(() => parseThresholds(bad)).toThrow(/^y\+ thresholds: expected 1 to 20 numbers ≥ 0 separated by commas, got "/);
  });

  it('defaults to y+ 1 and 5 (common practice: the viscous sublayer and its edge)', () => {
    expect(WALL_PANEL_DEFAULTS.thresholds).toEqual([1, 5]);
  });
});
