import * as client from 'openid-client';
import type { Logger } from '../core/logger';

export interface OidcSettings {
  issuer: string;
  clientId: string;
  clientSecret: string;
  scopes: string;
  allowInsecureHttp: boolean;
  redirectUri: string;
  postLogoutRedirectUri: string;
}

/** Raised when the identity provider cannot be reached (down, timing out, answering 5xx). */
export class ProviderUnavailable extends Error {
  override name = 'ProviderUnavailable';
}

/**
 * The API's view of any OpenID Connect provider: discovery, the authorization code flow with
 * PKCE, state and nonce, and RP-initiated logout. Nothing here knows which provider it talks to.
 * The discovered metadata is cached per process (it is the same for every process) and dropped
 * after a failure so a provider that comes back is found again.
 */
export class OidcClient {
  private config?: Promise<client.Configuration>;

  constructor(
    private readonly s: OidcSettings,
    private readonly logger: Logger,
  ) {}

  private configuration(): Promise<client.Configuration> {
    this.config ??= client
      .discovery(
        new URL(this.s.issuer),
        this.s.clientId,
        { client_secret: this.s.clientSecret },
        client.ClientSecretBasic(this.s.clientSecret),
        {
          execute: this.s.allowInsecureHttp ? [client.allowInsecureRequests] : [],
          timeout: 5,
        },
      )
      .catch((err: unknown) => {
        this.config = undefined;
        this.logger.error({ err, issuer: this.s.issuer }, 'identity provider discovery failed');
        throw new ProviderUnavailable(`discovery failed: ${(err as Error).message}`);
      });
    return this.config;
  }

  async authorizationUrl(): Promise<{ url: URL; state: string; nonce: string; codeVerifier: string }> {
    const config = await this.configuration();
    const codeVerifier = client.randomPKCECodeVerifier();
    const state = client.randomState();
    const nonce = client.randomNonce();
    const url = client.buildAuthorizationUrl(config, {
      redirect_uri: this.s.redirectUri,
      scope: this.s.scopes,
      code_challenge: await client.calculatePKCECodeChallenge(codeVerifier),
      code_challenge_method: 'S256',
      state,
      nonce,
    });
    return { url, state, nonce, codeVerifier };
  }

  /** Exchanges the code; checks state, nonce, PKCE and the ID token. Returns the identity. */
  async finish(callbackUrl: URL, checks: { state: string; nonce: string; codeVerifier: string }) {
    const config = await this.configuration();
    let tokens;
    try {
      tokens = await client.authorizationCodeGrant(config, callbackUrl, {
        pkceCodeVerifier: checks.codeVerifier,
        expectedState: checks.state,
        expectedNonce: checks.nonce,
        idTokenExpected: true,
      });
    } catch (err) {
      if (isNetworkFailure(err)) throw new ProviderUnavailable(`token exchange failed: ${(err as Error).message}`);
      throw err;
    }
    const claims = tokens.claims();
    if (!claims || !tokens.id_token) throw new Error('the provider returned no ID token');
    const email = typeof claims['email'] === 'string' && claims['email_verified'] !== false ? claims['email'] : null;
    const name = typeof claims['name'] === 'string' ? claims['name'] : null;
    return { issuer: String(claims.iss), subject: claims.sub, email, name, idToken: tokens.id_token };
  }

  /** The provider's end-session URL, or null when the provider cannot be reached. */
  async endSessionUrl(idToken: string): Promise<string | null> {
    try {
      const config = await this.configuration();
      if (!config.serverMetadata().end_session_endpoint) return null;
      return client.buildEndSessionUrl(config, {
        id_token_hint: idToken,
        post_logout_redirect_uri: this.s.postLogoutRedirectUri,
      }).href;
    } catch (err) {
      this.logger.warn({ err }, 'could not build the provider sign-out URL; signed out of Trabeate only');
      return null;
    }
  }
}

function isNetworkFailure(err: unknown): boolean {
  // Checked by name, not instanceof: fetch's errors may come from another realm (undici, test VMs).
  for (
    let e = err as (Error & { cause?: unknown; code?: unknown }) | undefined;
    e && typeof e === 'object';
    e = e.cause as typeof e
  ) {
    if (
      e.name === 'AbortError' ||
      e.name === 'TimeoutError' ||
      (e.name === 'TypeError' && /fetch failed/.test(e.message))
    )
      return true;
    if (typeof e.code === 'string' && /^(ECONNREFUSED|ECONNRESET|ETIMEDOUT|ENOTFOUND|UND_ERR)/.test(e.code))
      return true;
  }
  if (err instanceof client.ResponseBodyError && err.status >= 500) return true;
  return false;
}
