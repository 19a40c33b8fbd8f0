/**
 * The part of negotiator 1.x the API uses. The package ships no types and DefinitelyTyped's are of
 * 0.6, whose `encoding` has no `preferred` option (which encoding wins when the client rates
 * several alike).
 */
declare module 'negotiator' {
  import type { IncomingHttpHeaders } from 'node:http';

  export default class Negotiator {
    constructor(request: { headers: IncomingHttpHeaders });
    /** The client's most wanted of `available`; among equally rated ones the first of `preferred`. */
    encoding(available: readonly string[], options?: { preferred?: readonly string[] }): string | undefined;
  }
}
