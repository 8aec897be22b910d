// Setup for the API suite. testTimeout is a global Jest option, not a per-project one, so the
// suite sets its own here.
jest.setTimeout(20_000);

// oidc-provider warns on every load that Node 20 is not its preferred runtime; it works (see
// README, "Left / known"), and the warning would otherwise bury real output in every file.
const warn = console.warn.bind(console);
console.warn = (...args: unknown[]) => {
  if (typeof args[0] === 'string' && args[0].includes('oidc-provider WARNING: Unsupported runtime')) return;
  warn(...args);
};
