import { describe, expect, it, vi } from 'vitest';
import { createCloseGuard, type CloseChoice } from '../../../app/main/closeGuard.ts';

function guard(choice: CloseChoice) {
  const deps = { ask: vi.fn(() => choice), requestSaveAndClose: vi.fn(), forceClose: vi.fn() };
  return { g: createCloseGuard(deps), deps };
}

describe('close with unsaved changes', () => {
  it('closes at once when nothing is unsaved', () => {
    const { g, deps } = guard('cancel');
    expect(g.onClose()).toBe(false);
    expect(deps.ask).not.toHaveBeenCalled();
  });
  it('asks, and Cancel keeps the window', () => {
    const { g, deps } = guard('cancel');
    g.setState('a — Waymark', true);
    expect(g.onClose()).toBe(true);
    expect(deps.ask).toHaveBeenCalledWith('a — Waymark');
    expect(deps.forceClose).not.toHaveBeenCalled();
  });
  it("Don't Save closes without asking again", () => {
    const { g, deps } = guard('discard');
    g.setState('a', true);
    expect(g.onClose()).toBe(true);
    expect(deps.forceClose).toHaveBeenCalledOnce();
    expect(g.onClose()).toBe(false);
  });
  it('Save hands over to the renderer, which confirms after saving', () => {
    const { g, deps } = guard('save');
    g.setState('a', true);
    expect(g.onClose()).toBe(true);
    expect(deps.requestSaveAndClose).toHaveBeenCalledOnce();
    g.confirm();
    expect(deps.forceClose).toHaveBeenCalledOnce();
    expect(g.onClose()).toBe(false);
  });
});
