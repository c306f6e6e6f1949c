// Sign-in throttling with a clock the test moves (no waiting, no timed assertions).
// Limits: OWASP ASVS 4.0.3 V2.2.1 allows no more than 100 failed attempts per hour per account.
import { describe, expect, it } from 'vitest';
import { SignInThrottle } from '../../src/server/index.js';

const MINUTE = 60_000;

function clock() {
  let t = 1_000_000;
  return { now: () => t, advance: (ms: number) => (t += ms) };
}

describe('sign-in throttle', () => {
  it('locks a name for 15 minutes after 5 failures, whatever the address, then lets it try again', () => {
    const c = clock();
    const throttle = new SignInThrottle({ now: c.now });
    for (let i = 0; i < 4; i++) {
      throttle.fail('ana', `10.0.0.${i}`);
      expect(throttle.check('ana', '10.0.0.9').allowed).toBe(true);
    }
    throttle.fail('ana', '10.0.0.4');
    expect(throttle.check('ana', '10.0.0.9')).toEqual({ allowed: false, retryAfterSeconds: 15 * 60 });
    expect(throttle.check('ben', '10.0.0.9').allowed).toBe(true);
    c.advance(15 * MINUTE - 1000);
    expect(throttle.check('ana', '10.0.0.9')).toEqual({ allowed: false, retryAfterSeconds: 1 });
    c.advance(1000);
    expect(throttle.check('ana', '10.0.0.9').allowed).toBe(true);
  });

  it('bounds guessing on one account to at most 100 an hour (ASVS V2.2.1)', () => {
    const c = clock();
    const throttle = new SignInThrottle({ now: c.now });
    let tries = 0;
    for (let second = 0; second < 3600; second++) {
      const address = `10.1.${second % 250}.${second % 7}`; // many addresses, as a botnet would
      if (throttle.check('ana', address).allowed) {
        tries += 1;
        throttle.fail('ana', address);
      }
      c.advance(1000);
    }
    expect(tries).toBeGreaterThan(0);
    expect(tries).toBeLessThanOrEqual(100);
  });

  it('locks an address that tries many names, and counts unknown names like real ones', () => {
    const throttle = new SignInThrottle({ now: clock().now });
    for (let i = 0; i < 20; i++) throttle.fail(`nobody-${i}`, '192.0.2.7');
    expect(throttle.check('ana', '192.0.2.7').allowed).toBe(false);
    expect(throttle.check('ana', '192.0.2.8').allowed).toBe(true);
  });

  it('forgets failures older than the window, and a right password clears the name', () => {
    const c = clock();
    const throttle = new SignInThrottle({ now: c.now });
    for (let i = 0; i < 4; i++) throttle.fail('ana', '10.0.0.1');
    c.advance(16 * MINUTE);
    throttle.fail('ana', '10.0.0.1');
    expect(throttle.check('ana', '10.0.0.1').allowed).toBe(true);
    for (let i = 0; i < 3; i++) throttle.fail('ana', '10.0.0.1');
    throttle.succeed('ana');
    throttle.fail('ana', '10.0.0.1');
    expect(throttle.check('ana', '10.0.0.1').allowed).toBe(true);
  });

  it('keeps at most maxKeys counters, so a flood of names cannot fill memory', () => {
    const throttle = new SignInThrottle({ now: clock().now, maxKeys: 50 });
    for (let i = 0; i < 1000; i++) throttle.fail(`name-${i}`, `addr-${i}`);
    expect((throttle as unknown as { counters: Map<string, unknown> }).counters.size).toBeLessThanOrEqual(50);
  });
});
