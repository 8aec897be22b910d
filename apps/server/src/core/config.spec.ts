import { ConfigError, loadConfig } from './config';

describe('configuration', () => {
  it('names each missing or invalid variable', () => {
    try {
      loadConfig({ PORT: 'eighty', LOG_LEVEL: 'loud' });
      throw new Error('expected a ConfigError');
    } catch (err) {
      expect(err).toBeInstanceOf(ConfigError);
      const message = (err as ConfigError).message;
      expect(message).toMatch(/DATABASE_URL is required/);
      expect(message).toMatch(/PORT/);
      expect(message).toMatch(/LOG_LEVEL/);
    }
  });

  it('rejects a database URL that is not PostgreSQL', () => {
    expect(() => loadConfig({ DATABASE_URL: 'mysql://x@y/z' })).toThrow(/DATABASE_URL must be a postgres:\/\/ URL/);
  });

  it('applies defaults for optional settings and keeps the loopback host', () => {
    const config = loadConfig({ DATABASE_URL: 'postgres://a:b@127.0.0.1:5442/trabeate' });
    expect(config).toMatchObject({ HOST: '127.0.0.1', PORT: 4310, NODE_ENV: 'development', TRUST_PROXY: false });
  });
});

describe('sign-in configuration', () => {
  const base = { DATABASE_URL: 'postgres://a:b@127.0.0.1:5442/trabeate' };
  const secret = 'x'.repeat(32);

  it('requires the provider and a session secret in production', () => {
    expect(() => loadConfig({ ...base, NODE_ENV: 'production' })).toThrow(/OIDC_ISSUER is required in production[\s\S]*SESSION_SECRET is required in production/);
  });

  it('accepts an https provider with its client id and secret', () => {
    const config = loadConfig({ ...base, NODE_ENV: 'production', OIDC_ISSUER: 'https://login.example.com', OIDC_CLIENT_ID: 'trabeate', OIDC_CLIENT_SECRET: 's', SESSION_SECRET: secret });
    expect(config).toMatchObject({ OIDC_ALLOW_INSECURE_HTTP: false, SESSION_IDLE_MINUTES: 60, SESSION_ABSOLUTE_HOURS: 12 });
  });

  it('refuses a plain-http provider unless allowed, and allows it only on loopback', () => {
    const http = { ...base, OIDC_CLIENT_ID: 'c', OIDC_CLIENT_SECRET: 's', SESSION_SECRET: secret };
    expect(() => loadConfig({ ...http, OIDC_ISSUER: 'http://127.0.0.1:4311' })).toThrow(/OIDC_ISSUER must be https/);
    expect(loadConfig({ ...http, OIDC_ISSUER: 'http://127.0.0.1:4311', OIDC_ALLOW_INSECURE_HTTP: 'true' }).OIDC_ALLOW_INSECURE_HTTP).toBe(true);
    expect(() => loadConfig({ ...http, NODE_ENV: 'production', OIDC_ISSUER: 'http://login.example.com', OIDC_ALLOW_INSECURE_HTTP: 'true' })).toThrow(
      /OIDC_ALLOW_INSECURE_HTTP is allowed only for an issuer on loopback/,
    );
  });

  it('needs the client id and secret with an issuer, and a long enough session secret', () => {
    expect(() => loadConfig({ ...base, OIDC_ISSUER: 'https://login.example.com' })).toThrow(/OIDC_CLIENT_ID and OIDC_CLIENT_SECRET are required/);
    expect(() => loadConfig({ ...base, SESSION_SECRET: 'short' })).toThrow(/SESSION_SECRET must be at least 32 characters/);
  });
});
