import { describe, expect, it } from 'vitest';
import { ConfigError, loadConfig } from './config';

const good = { DATABASE_URL: 'postgres://a:b@127.0.0.1:5432/x', SESSION_SECRET: 'x'.repeat(32) };

describe('loadConfig', () => {
  it('takes a good environment and fills the defaults', () => {
    const c = loadConfig(good);
    expect(c.PORT).toBe(4870);
    expect(c.HOST).toBe('127.0.0.1');
    expect(c.MAX_CLOCK_SKEW_HOURS).toBe(24);
  });

  it('names the variable that holds a bad value', () => {
    expect(() => loadConfig({ ...good, PORT: 'eighty' })).toThrow(ConfigError);
    expect(() => loadConfig({ ...good, PORT: 'eighty' })).toThrow(/PORT/);
    expect(() => loadConfig({ ...good, DATABASE_URL: 'mysql://x' })).toThrow(/DATABASE_URL/);
    expect(() => loadConfig({ ...good, SESSION_SECRET: 'short' })).toThrow(/SESSION_SECRET: must be at least 32/);
  });

  it('says when a required variable is missing', () => {
    expect(() => loadConfig({ SESSION_SECRET: 'x'.repeat(32) })).toThrow(/DATABASE_URL.*not set/);
  });
});
