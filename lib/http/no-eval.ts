// zod compiles fast object parsers with `new Function` and, to see whether it may, tries once at
// the first object schema it builds. The app's Content-Security-Policy forbids eval (next.config.ts),
// so the try fails quietly but the browser still reports a policy violation. Switched off here,
// before any schema is built, in every JavaScript realm that parses with zod in the browser: the page
// (instrumentation-client.ts) and the field worker (lib/studio/client/field-worker.ts).
import { z } from 'zod';

z.config({ jitless: true });
