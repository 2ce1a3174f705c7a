#!/usr/bin/env node
// Launcher: runs the compiled command line (built by `npm install` through the prepare script).
import('../dist/cli/main.js').catch((err) => {
  if (err && err.code === 'ERR_MODULE_NOT_FOUND') {
    process.stderr.write('kerrtrace: the compiled files are missing; run `npm install` (or `npm run build`) in the project folder first.\n');
  } else {
    process.stderr.write(`kerrtrace: ${err && err.message ? err.message : String(err)}\n`);
  }
  process.exit(1);
});
