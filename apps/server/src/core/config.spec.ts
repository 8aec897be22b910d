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
