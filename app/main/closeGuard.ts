/**
 * What closing the window does when the plan has unsaved changes: ask Save / Don't Save /
 * Cancel. "Save" hands over to the renderer (it saves, then confirms the close); "Don't Save"
 * closes; "Cancel" keeps the window. Plain logic over injected actions, testable without Electron.
 */
export type CloseChoice = 'save' | 'discard' | 'cancel';

export interface CloseGuardDeps {
  ask(documentTitle: string): CloseChoice;
  requestSaveAndClose(): void;
  forceClose(): void;
}

export interface CloseGuard {
  setState(title: string, dirty: boolean): void;
  /** Called from the window's 'close' event; returns true when the close must be prevented. */
  onClose(): boolean;
  /** The renderer saved (or the user discarded): close without asking. */
  confirm(): void;
}

export function createCloseGuard(deps: CloseGuardDeps): CloseGuard {
  let dirty = false;
  let title = '';
  let confirmed = false;
  return {
    setState(t, d) {
      title = t;
      dirty = d;
    },
    onClose() {
      if (!dirty || confirmed) return false;
      const choice = deps.ask(title);
      if (choice === 'save') deps.requestSaveAndClose();
      else if (choice === 'discard') {
        confirmed = true;
        deps.forceClose();
      }
      return true;
    },
    confirm() {
      confirmed = true;
      deps.forceClose();
    },
  };
}
