// The environment check: production refuses the public development secrets; bad values are
// named with what is wrong, all at once.
import { describe, expect, it } from 'vitest';
import { loadConfig } from '../../server/config';

describe('loadConfig', () => {
  it('accepts the development defaults outside production', () => {
    expect(loadConfig({ NODE_ENV: 'development' }).SESSION_SECRET.length).toBeGreaterThanOrEqual(16);
  });

  it('refuses the development session secret and signing passphrase in production', () => {
    expect(() => loadConfig({ NODE_ENV: 'production' })).toThrow(/SESSION_SECRET: set a secret of your own[\s\S]*SIGNING_KEY_PASSPHRASE: set a secret/);
    expect(() => loadConfig({ NODE_ENV: 'production', SESSION_SECRET: 'a'.repeat(32) })).toThrow(/SIGNING_KEY_PASSPHRASE/);
    expect(loadConfig({ NODE_ENV: 'production', SESSION_SECRET: 'a'.repeat(32), SIGNING_KEY_PASSPHRASE: 'b'.repeat(20) }).NODE_ENV).toBe('production');
  });

  it('requires a long signing key passphrase in production', () => {
    expect(() => loadConfig({ NODE_ENV: 'production', SESSION_SECRET: 'a'.repeat(32), SIGNING_KEY_PASSPHRASE: 'b'.repeat(19) })).toThrow(/SIGNING_KEY_PASSPHRASE: use at least 20 characters in production/);
    expect(loadConfig({ NODE_ENV: 'development', SIGNING_KEY_PASSPHRASE: 'b'.repeat(8) }).SIGNING_KEY_PASSPHRASE).toHaveLength(8);
  });

  it('makes cookies Secure under NODE_ENV=production unless told otherwise', () => {
    const production = { NODE_ENV: 'production', SESSION_SECRET: 'a'.repeat(32), SIGNING_KEY_PASSPHRASE: 'b'.repeat(20) };
    expect(loadConfig(production).COOKIE_SECURE).toBe(true);
    expect(loadConfig({ ...production, COOKIE_SECURE: 'false' }).COOKIE_SECURE).toBe(false);
    expect(loadConfig({ NODE_ENV: 'development' }).COOKIE_SECURE).toBe(false);
    expect(loadConfig({ NODE_ENV: 'development', COOKIE_SECURE: 'true' }).COOKIE_SECURE).toBe(true);
  });

  it('names each bad value', () => {
    expect(() => loadConfig({ PORT: 'eighty', RUN_STARTS_PER_MINUTE: '0' })).toThrow(/PORT:[\s\S]*RUN_STARTS_PER_MINUTE:/);
  });
});
