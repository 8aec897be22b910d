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

  it('reuses a health check for 2 s unless HEALTH_MAX_AGE_MS says otherwise, and refuses a negative age', () => {
    const base = { DATABASE_URL: 'postgres://a:b@127.0.0.1:5442/trabeate' };
    expect(loadConfig(base).HEALTH_MAX_AGE_MS).toBe(2000);
    expect(loadConfig({ ...base, HEALTH_MAX_AGE_MS: '0' }).HEALTH_MAX_AGE_MS).toBe(0);
    expect(() => loadConfig({ ...base, HEALTH_MAX_AGE_MS: '-1' })).toThrow(/HEALTH_MAX_AGE_MS/);
  });
});

describe('sign-in configuration', () => {
  const base = { DATABASE_URL: 'postgres://a:b@127.0.0.1:5442/trabeate' };
  const secret = 'x'.repeat(32);

  it('requires the provider and a session secret in production', () => {
    expect(() => loadConfig({ ...base, NODE_ENV: 'production' })).toThrow(
      /OIDC_ISSUER is required in production[\s\S]*SESSION_SECRET is required in production/,
    );
  });

  it('accepts an https provider with its client id and secret', () => {
    const config = loadConfig({
      ...base,
      NODE_ENV: 'production',
      OIDC_ISSUER: 'https://login.example.com',
      OIDC_CLIENT_ID: 'trabeate',
      OIDC_CLIENT_SECRET: 's',
      SESSION_SECRET: secret,
      S3_BUCKET: 'firm-files',
      SMTP_HOST: 'smtp.example.com',
    });
    expect(config).toMatchObject({
      OIDC_ALLOW_INSECURE_HTTP: false,
      SESSION_IDLE_MINUTES: 60,
      SESSION_ABSOLUTE_HOURS: 12,
    });
  });

  it('refuses a plain-http provider unless allowed, and allows it only on loopback', () => {
    const http = { ...base, OIDC_CLIENT_ID: 'c', OIDC_CLIENT_SECRET: 's', SESSION_SECRET: secret };
    expect(() => loadConfig({ ...http, OIDC_ISSUER: 'http://127.0.0.1:4311' })).toThrow(/OIDC_ISSUER must be https/);
    expect(
      loadConfig({ ...http, OIDC_ISSUER: 'http://127.0.0.1:4311', OIDC_ALLOW_INSECURE_HTTP: 'true' })
        .OIDC_ALLOW_INSECURE_HTTP,
    ).toBe(true);
    expect(() =>
      loadConfig({
        ...http,
        NODE_ENV: 'production',
        OIDC_ISSUER: 'http://login.example.com',
        OIDC_ALLOW_INSECURE_HTTP: 'true',
      }),
    ).toThrow(/OIDC_ALLOW_INSECURE_HTTP is allowed only for an issuer on loopback/);
  });

  it('needs the client id and secret with an issuer, and a long enough session secret', () => {
    expect(() => loadConfig({ ...base, OIDC_ISSUER: 'https://login.example.com' })).toThrow(
      /OIDC_CLIENT_ID and OIDC_CLIENT_SECRET are required/,
    );
    expect(() => loadConfig({ ...base, SESSION_SECRET: 'short' })).toThrow(
      /SESSION_SECRET must be at least 32 characters/,
    );
  });
});

describe('files and mail configuration', () => {
  const base = { DATABASE_URL: 'postgres://a:b@127.0.0.1:5442/trabeate' };
  const production = {
    ...base,
    NODE_ENV: 'production',
    OIDC_ISSUER: 'https://login.example.com',
    OIDC_CLIENT_ID: 'c',
    OIDC_CLIENT_SECRET: 's',
    SESSION_SECRET: 'x'.repeat(32),
  };

  it('requires the S3 bucket and the SMTP host in production, naming each', () => {
    expect(() => loadConfig(production)).toThrow(
      /S3_BUCKET is required in production[\s\S]*SMTP_HOST is required in production/,
    );
    expect(() => loadConfig({ ...production, S3_BUCKET: 'firm-files' })).toThrow(/SMTP_HOST is required/);
    const ok = loadConfig({
      ...production,
      S3_BUCKET: 'firm-files',
      SMTP_HOST: 'smtp.example.com',
      UPLOAD_MAX_BYTES: '52428800',
    });
    expect(ok).toMatchObject({
      S3_BUCKET: 'firm-files',
      SMTP_HOST: 'smtp.example.com',
      UPLOAD_MAX_BYTES: 52_428_800,
      SMTP_PORT: 2525,
    });
  });

  it('leaves bucket and mail host to local defaults outside production', () => {
    const config = loadConfig(base);
    expect(config.S3_BUCKET).toBeUndefined();
    expect(config.SMTP_HOST).toBeUndefined();
    expect(config.UPLOAD_MAX_BYTES).toBe(1024 * 1024 * 1024);
  });

  it('refuses a bad bucket name, half a key pair, and a bad upload limit', () => {
    expect(() => loadConfig({ ...base, S3_BUCKET: 'Bad_Bucket' })).toThrow(/S3_BUCKET must be a valid S3 bucket name/);
    expect(() => loadConfig({ ...base, S3_ACCESS_KEY_ID: 'k' })).toThrow(
      /S3_ACCESS_KEY_ID and S3_SECRET_ACCESS_KEY must be set together/,
    );
    expect(() => loadConfig({ ...base, UPLOAD_MAX_BYTES: '0' })).toThrow(/UPLOAD_MAX_BYTES/);
  });

  it('takes the development outbox only on loopback, and never in production', () => {
    expect(loadConfig({ ...base, DEV_OUTBOX_URL: 'http://127.0.0.1:4314' }).DEV_OUTBOX_URL).toBe(
      'http://127.0.0.1:4314',
    );
    expect(() => loadConfig({ ...base, DEV_OUTBOX_URL: 'http://mail.example.com:4314' })).toThrow(
      /DEV_OUTBOX_URL must point at the SMTP fake on loopback/,
    );
    expect(() =>
      loadConfig({ ...production, S3_BUCKET: 'b1b', SMTP_HOST: 'h', DEV_OUTBOX_URL: 'http://127.0.0.1:4314' }),
    ).toThrow(/DEV_OUTBOX_URL is for the local SMTP fake only/);
  });
});

describe('card payments configuration', () => {
  const base = { DATABASE_URL: 'postgres://a:b@127.0.0.1:5442/trabeate' };
  const keys = { STRIPE_SECRET_KEY: 'sk_test_abc123', STRIPE_WEBHOOK_SECRET: 'whsec_abc123' };

  it('needs the webhook secret with the secret key, and refuses values of the wrong kind', () => {
    expect(() => loadConfig({ ...base, STRIPE_SECRET_KEY: 'sk_test_abc123' })).toThrow(
      /STRIPE_WEBHOOK_SECRET is required with STRIPE_SECRET_KEY/,
    );
    expect(() => loadConfig({ ...base, ...keys, STRIPE_SECRET_KEY: 'pk_test_abc' })).toThrow(
      /STRIPE_SECRET_KEY must be a Stripe secret key/,
    );
    expect(loadConfig({ ...base, ...keys })).toMatchObject(keys);
  });

  it('points at a payments fake only on loopback, and never in production', () => {
    expect(loadConfig({ ...base, ...keys, STRIPE_API_HOST: '127.0.0.1', STRIPE_API_PORT: '4315' })).toMatchObject({
      STRIPE_API_HOST: '127.0.0.1',
      STRIPE_API_PORT: 4315,
    });
    expect(() => loadConfig({ ...base, ...keys, STRIPE_API_HOST: 'payments.example.com' })).toThrow(
      /STRIPE_API_HOST must be the payments fake on loopback/,
    );
    const production = {
      ...base,
      ...keys,
      NODE_ENV: 'production',
      OIDC_ISSUER: 'https://login.example.com',
      OIDC_CLIENT_ID: 'c',
      OIDC_CLIENT_SECRET: 's',
      SESSION_SECRET: 'x'.repeat(32),
      S3_BUCKET: 'firm-files',
      SMTP_HOST: 'smtp.example.com',
    };
    expect(loadConfig(production).STRIPE_API_HOST).toBeUndefined();
    expect(() => loadConfig({ ...production, STRIPE_API_HOST: '127.0.0.1' })).toThrow(
      /STRIPE_API_HOST and STRIPE_API_PORT\/PROTOCOL are for the local payments fake only/,
    );
  });
});
