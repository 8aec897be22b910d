// testTimeout is a global Jest option, not a per-project one: the API suite sets its own here.
jest.setTimeout(20_000);
