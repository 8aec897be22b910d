// ESLint, Prettier and tsc over the whole repository take tens of seconds on two cores.
jest.setTimeout(300_000);
