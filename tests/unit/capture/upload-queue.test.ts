import { describe, expect, it } from 'vitest';
import { canDismiss, dismissItem, mergeQueue, needsAttention, removeQuestion, retryItem, sendOrder, type UploadItem } from '../../../components/capture/upload-queue';

const item = (key: string, p: Partial<UploadItem<string>> = {}): UploadItem<string> => ({ key, name: `${key}.jpg`, role: 'on', progress: 0, state: 'waiting', file: key, ...p });

describe('the upload list across drops', () => {
  const refused = item('bad', { state: 'refused', message: 'bad.jpg is not an image.' });
  const done = item('good', { state: 'done', progress: 1, message: 'Uploaded.' });
  const sending = item('busy', { state: 'sending', progress: 0.4 });
  const noRole = item('who', { role: null });

  it('keeps a refused file and its message when the next files are dropped', () => {
    const next = mergeQueue([refused, done], [item('new-off', { role: 'off' })]);
    expect(next.map((i) => i.key)).toEqual(['new-off', 'bad']);
    expect(next[1]).toEqual(refused);
  });

  it('keeps uploads still sending and files still waiting for a role; finished ones make room', () => {
    expect(mergeQueue([done, sending, noRole], [item('n')]).map((i) => i.key)).toEqual(['n', 'busy', 'who']);
    expect([refused, sending, noRole].every(needsAttention)).toBe(true);
    expect(needsAttention(done)).toBe(false);
    expect(needsAttention(item('queued'))).toBe(false);
  });

  it('does not list a retried file twice', () => {
    const retried = retryItem(refused) as UploadItem<string>;
    expect(mergeQueue([refused, done], [retried]).map((i) => i.key)).toEqual(['bad']);
  });

  it('dismisses a refused or finished entry or one waiting for a role, never one being sent or queued', () => {
    expect(dismissItem([refused, done, sending, noRole], 'bad').map((i) => i.key)).toEqual(['good', 'busy', 'who']);
    expect(dismissItem([refused, done], 'good').map((i) => i.key)).toEqual(['bad']);
    expect(dismissItem([noRole, done], 'who').map((i) => i.key)).toEqual(['good']);
    expect(dismissItem([sending], 'busy')).toEqual([sending]);
    const queued = item('queued');
    expect(dismissItem([queued], 'queued')).toEqual([queued]);
    expect([refused, done, noRole].every(canDismiss)).toBe(true);
    expect([sending, queued].some(canDismiss)).toBe(false);
  });

  it('a retry sends the same file again with its message cleared', () => {
    expect(retryItem(refused)).toEqual({ key: 'bad', name: 'bad.jpg', role: 'on', progress: 0, state: 'waiting', file: 'bad' });
    expect(retryItem(done)).toBeNull();
    expect(retryItem({ ...refused, role: null })).toBeNull();
  });

  it('keeps what a replacement replaces through a retry', () => {
    const r = item('rep', { state: 'refused', message: 'too large', replaces: { id: 'p1', name: 'old-on.jpg' } });
    expect(retryItem(r)?.replaces).toEqual({ id: 'p1', name: 'old-on.jpg' });
  });

  it('sends on first, then off, ambient, dark, and files without a role last', () => {
    const batch = [item('d', { role: 'dark' }), item('x', { role: null }), item('a', { role: 'ambient' }), item('f', { role: 'off' }), item('o', { role: 'on' })];
    expect(sendOrder(batch).map((i) => i.key)).toEqual(['o', 'f', 'a', 'd', 'x']);
  });
});

describe('removing a photo', () => {
  it('asks with the file’s name and role, and says what happens to readings', () => {
    expect(removeQuestion({ originalName: 'vx-on.jpg', role: 'on' }, 'Display on')).toBe(
      'Remove vx-on.jpg (display on)? The file is deleted. Readings made from it are kept and marked as made from photos that have since changed.',
    );
    expect(removeQuestion({ originalName: '', role: 'dark' }, 'Dark room')).toMatch(/^Remove the dark photo \(dark room\)\?/);
  });
});
