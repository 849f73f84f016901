#!/usr/bin/env bash
# The two real-editor layers, with the shared real-editor tool:
#   1. test/editor: mocha inside a real VS Code extension host, on the
#      development build (dist/, loaded as a development extension);
#   2. test/editor/ui/preview-ui.js: the path preview driven through the
#      editor's UI, on a freshly built production .vsix installed as a user
#      would install it.
# Both layers always run; the exit code is non-zero when either failed. The
# .vsix and the screenshots go to test-output/ (gitignored).
# The tool lives in shared/tools/real-editor beside the repo (../shared
# relative to the repo root), here and in CI alike; REAL_EDITOR overrides its path.
set -euo pipefail
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
TOOL="${REAL_EDITOR:-$(dirname "$ROOT")/shared/tools/real-editor/real-editor.sh}"
[ -f "$TOOL" ] || { echo "test-editor: real-editor tool not found at $TOOL (set REAL_EDITOR)" >&2; exit 2; }
cd "$ROOT"
OUT="$ROOT/test-output"
VSIX="$OUT/veer.vsix"
mkdir -p "$OUT"

node scripts/build.mjs
host_status=0
bash "$TOOL" ext-test "$ROOT/test/editor/workspace" "$ROOT" "$ROOT/test/editor" || host_status=$?

# `npm run package` builds in production mode; the extra argument goes to vsce.
rm -f "$VSIX"
npm run --silent package -- --out "$VSIX" >"$OUT/package.log" 2>&1 || { cat "$OUT/package.log"; exit 1; }
ui_status=0
# REAL_EDITOR_DIR tells the UI scripts where the tool's page helpers are.
for script in preview-ui.js typing-ui.js sampling-ui.js recorded-ui.js; do
  REAL_EDITOR_DIR="$(dirname "$TOOL")" EXTENSIONS="$VSIX" \
    bash "$TOOL" ui "$ROOT/test/editor/workspace" "$ROOT/test/editor/ui/$script" "$OUT" || ui_status=$?
done
# The pictures in docs/ (walkthrough, preview in light and dark), taken by the test itself.
REAL_EDITOR_DIR="$(dirname "$TOOL")" EXTENSIONS="$VSIX" \
  bash "$TOOL" ui "$ROOT/test/editor/workspace" "$ROOT/test/editor/ui/docs-ui.js" "$ROOT/docs" || ui_status=$?
# Leave the development build (with source maps) in dist/, as `npm run build` does.
node scripts/build.mjs

echo "test-editor: extension host suite $([ $host_status = 0 ] && echo passed || echo "FAILED ($host_status)"); UI scripts $([ $ui_status = 0 ] && echo passed || echo "FAILED ($ui_status)")"
[ $host_status = 0 ] && [ $ui_status = 0 ]
