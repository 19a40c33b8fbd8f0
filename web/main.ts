import { config } from 'zod';

// zod compiles fast object parsers with `new Function` when it may, and finds out whether it may
// by calling `new Function` as each object schema is built; the Content-Security-Policy refuses
// that call and reports it as a violation. So zod is told not to, before any schema exists: the
// application (and every schema in it) is loaded only after this line, as its own chunk.
config({ jitless: true });

void import('./start').then(({ start }) => start());
