/**
 * The demo studio's characters, for whoever shows or tests the product (the seeds, the tests,
 * the studio's practice page): imported as lib/groom/demo, never through the groom library's
 * public API, so that only code that asks for the demo surfaces loads them.
 */
export { DEMO_GROOMS, DEMO_STUDIO, type DemoGroom } from './grooms';
export { surfaceToObj } from './obj';
