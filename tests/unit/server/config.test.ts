import { describe, expect, it } from 'vitest';
import { ConfigError, parseConfig } from '#lib/server/config.ts';

const valid = {
  DATABASE_URL: 'postgres://u:p@127.0.0.1:5432/db',
  AUTH_SECRET: 'x'.repeat(32),
};

describe('parseConfig', () => {
  it('fills local defaults around the two required settings', () => {
    const c = parseConfig(valid);
    expect(c.PUBLIC_ORIGIN).toBe('http://localhost:4321');
    expect(c.S3_BUCKET).toBe('edgewise-raw');
    expect(c.SMTP_PORT).toBe(2526);
    expect(c.TRUST_PROXY).toBe(false);
  });

  it('names every missing variable', () => {
    expect(() => parseConfig({})).toThrow(ConfigError);
    try {
      parseConfig({});
    } catch (err) {
      expect((err as Error).message).toMatch(/DATABASE_URL/);
      expect((err as Error).message).toMatch(/AUTH_SECRET/);
    }
  });

  it('names a bad value and says what is wrong with it', () => {
    expect(() => parseConfig({ ...valid, SMTP_PORT: 'seventy' })).toThrow(/SMTP_PORT/);
    expect(() => parseConfig({ ...valid, AUTH_SECRET: 'short' })).toThrow(
      /AUTH_SECRET: must be at least 32 characters/,
    );
    expect(() => parseConfig({ ...valid, DATABASE_URL: 'mysql://x' })).toThrow(
      /DATABASE_URL: must be a postgres/,
    );
    expect(() => parseConfig({ ...valid, S3_BUCKET: 'Bad_Bucket' })).toThrow(/S3_BUCKET/);
  });

  it('reads booleans and numbers from their string forms', () => {
    const c = parseConfig({ ...valid, TRUST_PROXY: 'true', SMTP_PORT: '2600' });
    expect(c.TRUST_PROXY).toBe(true);
    expect(c.SMTP_PORT).toBe(2600);
  });
});
