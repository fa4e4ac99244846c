import { z } from 'zod';

// zod compiles fast object parsers with Function() unless told not to; the page's
// policy forbids eval, and even zod's probe for it is reported as a CSP violation.
// Import this module before any schema parses in the browser.
z.config({ jitless: true });
