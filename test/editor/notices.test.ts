/**
 * Messages close by themselves (src/editor/controller.ts, notify): information after 6 s, a warning after 30 s, an
 * error only when dismissed; at most five are shown. Checked with vitest's fake clock on a controller in Node.
 */
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { nodeController } from './nodeController';

describe('messages close by themselves', () => {
  beforeEach(() => { vi.useFakeTimers(); });
  afterEach(() => { vi.useRealTimers(); });

  it('information after 6 s, a warning after 30 s, an error never', () => {
    const c = nodeController();
    c.openDemo(false);
    c.dismissAllNotices();
    c.notify('info', 'an information');
    c.notify('warning', 'a warning');
    c.notify('error', 'an error');
    const shown = () => c.session.notices.map((n) => n.text);
    vi.advanceTimersByTime(5999);
    expect(shown()).toEqual(['an information', 'a warning', 'an error']);
    vi.advanceTimersByTime(1);
    expect(shown()).toEqual(['a warning', 'an error']);
    vi.advanceTimersByTime(30_000 - 6000 - 1);
    expect(shown()).toEqual(['a warning', 'an error']);
    vi.advanceTimersByTime(1);
    expect(shown()).toEqual(['an error']);
    vi.advanceTimersByTime(10 * 60_000);
    expect(shown()).toEqual(['an error']);
    c.dismissNotice(c.session.notices[0].id);
    expect(shown()).toEqual([]);
  });

  it('a message closed by hand before its time is not disturbed by its timer; at most five are shown', () => {
    const c = nodeController();
    c.openDemo(false);
    c.dismissAllNotices();
    c.notify('info', 'first');
    c.dismissNotice(c.session.notices[0].id);
    vi.advanceTimersByTime(3000);
    c.notify('info', 'second');
    vi.advanceTimersByTime(3000); // the first one's timer fires now: the second stays
    expect(c.session.notices.map((n) => n.text)).toEqual(['second']);
    for (let i = 0; i < 7; i++) c.notify('error', `e${i}`);
    expect(c.session.notices.map((n) => n.text)).toEqual(['e2', 'e3', 'e4', 'e5', 'e6']);
  });
});
