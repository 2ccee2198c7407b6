/** Process entry of the command line; everything else is in main.ts so tests can call it in-process. */
import { main } from './main.ts';

main(process.argv.slice(2)).then((code) => {
  process.exitCode = code;
});
