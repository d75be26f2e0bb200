// The payment webhook route (app/api/payments/webhook/route.ts) in a process of its own, for the
// payments chaos test, which kills it with SIGKILL mid-stream as a crash of the app server would
// and starts another. Run with `node --import tsx` and the stack's environment; it tells its
// parent the port it listens on over the IPC channel of child_process.fork.
import { POST } from '@/app/api/payments/webhook/route';
import { serveRoute } from './route-server';

const route = await serveRoute(POST);
process.send!({ port: route.port });
