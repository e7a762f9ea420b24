/** The environment test hooks of the Redis commands: unset means "not set", anything else must be a whole number. */
import { afterEach, describe, expect, it } from 'vitest';
import { DisksweepError } from '../../../shared/errors.js';
import { testHookInteger } from '../../../orchestrator/cli/redis-flags.js';

const NAME = 'DISKSWEEP_TEST_HOOK_UNDER_TEST';

describe('testHookInteger', () => {
  afterEach(() => {
    delete process.env[NAME];
  });

  it('is undefined when unset or empty, and the number when it is a whole number at or above the minimum', () => {
    expect(testHookInteger(NAME, 1, 'seconds')).toBeUndefined();
    process.env[NAME] = '';
    expect(testHookInteger(NAME, 1, 'seconds')).toBeUndefined();
    process.env[NAME] = '3000';
    expect(testHookInteger(NAME, 100, 'ms')).toBe(3000);
    process.env[NAME] = '1';
    expect(testHookInteger(NAME, 1, 'seconds')).toBe(1);
  });

  it('refuses a fraction, a number below the minimum or text, naming the variable, the unit and the value', () => {
    for (const bad of ['1.5', '0', 'soon']) {
      process.env[NAME] = bad;
      expect(() => testHookInteger(NAME, 1, 'seconds')).toThrow(DisksweepError);
      expect(() => testHookInteger(NAME, 1, 'seconds')).toThrow(`${NAME}: expected a whole number of seconds >= 1 (got "${bad}")`);
    }
    process.env[NAME] = '99';
    expect(() => testHookInteger(NAME, 100, 'ms')).toThrow(`${NAME}: expected a whole number of ms >= 100 (got "99")`);
  });
});
