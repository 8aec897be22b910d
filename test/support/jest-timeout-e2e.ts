// testTimeout is a global Jest option, not a per-project one: the browser suite sets its own here.
jest.setTimeout(60_000);
