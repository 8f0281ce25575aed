import { describe, expect, it } from 'vitest';
import { describeCondition, meetsCondition, toCondition } from '../../../lib/targets/conditions';
import { targetSchema } from '../../../lib/schemas/target';

describe('a target condition on the slanted-edge pattern', () => {
  it('is kept from storage, judged against the set’s pattern and described in words', () => {
    const c = toCondition({ pattern: 'slanted-edge' });
    expect(c).toEqual({ pattern: 'slanted-edge' });
    expect(meetsCondition(c, { pattern: 'slanted-edge', ambientLux: null, backgroundCdm2: null })).toEqual({ ok: true });
    expect(meetsCondition(c, { pattern: 'full', ambientLux: null, backgroundCdm2: null })).toEqual({ ok: false, why: 'full-white pattern' });
    expect(describeCondition(c)).toContain('slanted-edge');
  });

  it('is a pattern the target form accepts; an unknown one is refused in words', () => {
    expect(targetSchema.shape.pattern.parse('slanted-edge')).toBe('slanted-edge');
    const bad = targetSchema.shape.pattern.safeParse('stripes');
    expect(bad.success).toBe(false);
    expect(bad.error?.issues[0]?.message).toBe('Pick full white, checkerboard or slanted edge');
  });
});
