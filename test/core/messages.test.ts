import { strict as assert } from 'node:assert';
import { parsePreviewMessage } from '../../src/shared/messages';

// The host treats what the webview posts as untrusted: only messages of the
// declared shape, with values in range, get through.

describe('preview messages', () => {
  const stamp = { uri: 'file:///a.veer', version: 3 };

  it('accepts a drawing width within range, as an integer', () => {
    assert.deepEqual(parsePreviewMessage({ type: 'viewSize', ...stamp, width: 640 }), { type: 'viewSize', ...stamp, width: 640 });
    for (const width of [199, 4001, 640.5, '640', NaN, Infinity, -1]) {
      assert.equal(parsePreviewMessage({ type: 'viewSize', ...stamp, width }), undefined, String(width));
    }
  });

  it('accepts a copy of the targets as CSV or Markdown only', () => {
    assert.deepEqual(parsePreviewMessage({ type: 'copyTargets', ...stamp, format: 'csv' }), { type: 'copyTargets', ...stamp, format: 'csv' });
    assert.equal(parsePreviewMessage({ type: 'copyTargets', ...stamp, format: 'html' }), undefined);
  });

  it('drops extra fields and unknown types', () => {
    assert.deepEqual(parsePreviewMessage({ type: 'reveal', ...stamp, line: 4, evil: 'x' }), { type: 'reveal', ...stamp, line: 4 });
    assert.equal(parsePreviewMessage({ type: 'runScript', ...stamp }), undefined);
  });
});
