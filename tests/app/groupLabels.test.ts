/** The user's surface-group labels: keyed by the file's group name, written sorted, shown in result definitions. */
import { describe, expect, it } from 'vitest';
import { GroupLabels } from '../../src/app/groupLabels.ts';

describe('surface-group labels', () => {
  it('a group shows its file name until relabelled; an empty label or the file name brings it back', () => {
    const L = new GroupLabels();
    let calls = 0;
    L.onChange(() => calls++);
    expect(L.labelOf('zone 3')).toBe('zone 3');
    expect(L.set('zone 3', '  left outlet ')).toBe(true);
    expect(L.labelOf('zone 3')).toBe('left outlet');
    expect(L.set('zone 3', 'left outlet')).toBe(false);
    expect(L.set('zone 3', '')).toBe(true);
    expect(L.labelOf('zone 3')).toBe('zone 3');
    L.set('wall', 'hull');
    expect(L.set('wall', 'wall')).toBe(true);
    expect(L.doc()).toBeUndefined();
    expect(calls).toBe(4);
  });

  it('writes the map sorted by name, so equal labels give equal probe-set text; setFrom replaces all', () => {
    const a = new GroupLabels(), b = new GroupLabels();
    a.set('wall', 'hull'); a.set('inlet', 'intake');
    b.set('inlet', 'intake'); b.set('wall', 'hull');
    expect(JSON.stringify(a.doc())).toBe('{"inlet":"intake","wall":"hull"}');
    expect(JSON.stringify(b.doc())).toBe(JSON.stringify(a.doc()));
    let calls = 0;
    a.onChange(() => calls++);
    a.setFrom({ inlet: 'intake', wall: 'hull' });
    expect(calls).toBe(0);
    a.setFrom({ 'part 2': 'fin' });
    expect(calls).toBe(1);
    expect(a.doc()).toEqual({ 'part 2': 'fin' });
    expect(a.labelOf('wall')).toBe('wall');
    a.setFrom(undefined);
    expect(a.doc()).toBeUndefined();
  });

  it('relabels groups as the evaluators write them (id then quoted name), leaving quoted field names alone', () => {
    const L = new GroupLabels();
    L.set('wall', 'hull');
    L.set('p', 'not a field');
    expect(L.relabel('force on 2 "wall" + 5 "inlet"; viscous: wall-shear array "p"'))
      .toBe('force on 2 "hull" + 5 "inlet"; viscous: wall-shear array "p"');
    expect(L.relabel('wall quantities on 12 "p"')).toBe('wall quantities on 12 "not a field"');
  });

  it('keeps a label to the probe set\'s text limit (200 characters)', () => {
    const L = new GroupLabels();
    L.set('wall', 'x'.repeat(250));
    expect(L.labelOf('wall')).toHaveLength(200);
  });
});
