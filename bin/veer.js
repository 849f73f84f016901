#!/usr/bin/env node
'use strict';
// The `veer` command: runs the bundled command line (built by `npm run build`).
const path = require('node:path');
const fs = require('node:fs');
const bundle = path.join(__dirname, '..', 'dist', 'cli.js');
if (!fs.existsSync(bundle)) {
  process.stderr.write('veer: the command line is not built yet; run `npm run build` in ' + path.dirname(__dirname) + '\n');
  process.exit(2);
}
require(bundle).main();
