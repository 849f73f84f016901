#!/usr/bin/env bash
# Runs test/editor (mocha inside a real VS Code extension host) with the shared
# real-editor tool. The tool lives in shared/tools/real-editor beside the repo
# (../shared relative to the repo root), here and in CI alike; REAL_EDITOR
# overrides its path.
set -euo pipefail
ROOT="$(cd "$(dirname "${BASH_SOURCE[0]}")/.." && pwd)"
TOOL="${REAL_EDITOR:-$(dirname "$ROOT")/shared/tools/real-editor/real-editor.sh}"
[ -f "$TOOL" ] || { echo "test-editor: real-editor tool not found at $TOOL (set REAL_EDITOR)" >&2; exit 2; }
cd "$ROOT"
node scripts/build.mjs
exec bash "$TOOL" ext-test "$ROOT/test/editor/workspace" "$ROOT" "$ROOT/test/editor"
