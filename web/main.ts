import { config } from 'zod';
import { SESSION_PATH, readEarly } from './app/core/early-reads';

// zod compiles fast object parsers with `new Function` when it may, and finds out whether it may
// by calling `new Function` as each object schema is built; the Content-Security-Policy refuses
// that call and reports it as a violation. So zod is told not to, before any schema exists: the
// application (and every schema in it) is loaded only after this line, as its own chunk.
config({ jitless: true });

// Every page starts by asking who is signed in: ask now, while the application's scripts load
// (the session guard's own request is then answered from this one, see early-reads.ts).
void readEarly(SESSION_PATH);

void import('./start').then(({ start }) => start());
