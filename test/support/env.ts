/** Reads a variable that scripts/test.ts sets; explains how to run the suite when it is missing. */
export function testEnv(name: string): string {
  const value = process.env[name];
  if (!value) {
    throw new Error(
      `${name} is not set: run this suite through "npm test" (or "npm test -- <suite>"), which starts the services it needs.`,
    );
  }
  return value;
}
