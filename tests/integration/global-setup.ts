// Integration tests talk to the real PostgreSQL and the local stand-ins that `npm test` starts
// and describes in the environment. Without them, stop with a message that says what to run.
export default function checkTestStack() {
  if (process.env.WHORLWIND_TEST_STACK !== '1') {
    throw new Error(
      'Integration tests need the test services. Run them with `npm test` (all phases) or ' +
        '`npm test -- vitest tests/integration` (only vitest), which start and stop the services.',
    );
  }
}
