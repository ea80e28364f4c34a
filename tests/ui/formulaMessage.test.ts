/** The editor reads the column from the core parser's own messages. */
import { describe, expect, it } from 'vitest';
import { parseFormula } from '../../src/derive/formulaParse.ts';
import { errorColumn } from '../../src/ui/formulaMessage.ts';

const messageOf = (src: string): string => { try { parseFormula(src); return ''; } catch (e) { return (e as Error).message; } };

describe('errorColumn', () => {
  it('finds the column of a parse error', () => {
    expect(errorColumn(messageOf('0.5 * * p'))).toBe(7);
    expect(errorColumn(messageOf('p + (velocity.x'))).toBe(16);
    expect(errorColumn(messageOf('p $ 2'))).toBe(3);
  });

  it('gives none for a message without a column', () => {
    expect(errorColumn('formula "x": a field of that name exists already; choose another name')).toBeUndefined();
  });
});
