/**
 * The entry of the built command line (dist/cli/waymark.js, the installed `waymark`; see
 * build.ts). From a checkout, `npm run -s cli` runs main.ts through tsx instead.
 */
import { runProgram } from './main.ts';

await runProgram(process.argv);
