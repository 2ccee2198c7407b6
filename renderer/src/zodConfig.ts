/**
 * Must be imported before anything that builds zod schemas (core/setup.ts, core/campaign.ts): zod's
 * fast path compiles parsers with `new Function`, which the renderer's Content-Security-Policy forbids.
 * Without this, zod's probe for eval shows up as a policy violation on every start.
 */
import { z } from 'zod';

z.config({ jitless: true });
